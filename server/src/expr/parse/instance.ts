/**
 * The private mathjs parser: built from the parser's own factories, with refusing stubs for everything
 * the nodes would need to compile or evaluate. Only `mathParse` leaves this module; user text is never
 * evaluated by mathjs.
 */
import {
  config,
  createAccessorNode,
  createArrayNode,
  createAssignmentNode,
  createBlockNode,
  createConditionalNode,
  createConstantNode,
  createFunctionAssignmentNode,
  createFunctionNode,
  createIndexNode,
  createNode,
  createNumber,
  createNumeric,
  createObjectNode,
  createOperatorNode,
  createParenthesisNode,
  createParse,
  createRangeNode,
  createRelationalNode,
  createSymbolNode,
  createTyped,
} from 'mathjs';

/**
 * mathjs functions its security guidance says to disable, plus every other entry point that parses,
 * compiles, evaluates or alters an instance. They are refused as calls and as bare names (the private
 * parser below has no instance behind it that could run them).
 */
export const DISABLED_FUNCTIONS: readonly string[] = [
  'import',
  'createUnit',
  'evaluate',
  'parse',
  'compile',
  'simplify',
  'simplifyConstant',
  'simplifyCore',
  'rationalize',
  'derivative',
  'resolve',
  'reviver',
  'replacer',
  'symbolicEqual',
  'leafCount',
  'parser',
  'chain',
  'help',
  'typed',
  'config',
];

/** Property names that reach JavaScript internals; refused wherever they appear as a symbol. */
export const UNSAFE_NAMES = new Set([
  'constructor',
  '__proto__',
  'prototype',
  '__defineGetter__',
  '__defineSetter__',
  '__lookupGetter__',
  '__lookupSetter__',
  'hasOwnProperty',
  'isPrototypeOf',
  'propertyIsEnumerable',
  'toString',
  'toLocaleString',
  'valueOf',
  'eval',
  'Function',
  'globalThis',
  'window',
  'process',
  'require',
]);

/* The factories the parser is built from, and the default configuration: mathjs exports them but its
   types do not declare them. Named imports let the bundler keep these and drop the rest of mathjs. */
declare module 'mathjs' {
  /** A mathjs factory: called with its dependencies by name, it returns the function or class it makes. */
  type ParserFactory = (deps: Record<string, unknown>) => unknown;
  export const createTyped: ParserFactory;
  export const createNumber: ParserFactory;
  export const createNumeric: ParserFactory;
  export const createNode: ParserFactory;
  export const createAccessorNode: ParserFactory;
  export const createArrayNode: ParserFactory;
  export const createAssignmentNode: ParserFactory;
  export const createBlockNode: ParserFactory;
  export const createConditionalNode: ParserFactory;
  export const createConstantNode: ParserFactory;
  export const createFunctionAssignmentNode: ParserFactory;
  export const createIndexNode: ParserFactory;
  export const createObjectNode: ParserFactory;
  export const createOperatorNode: ParserFactory;
  export const createParenthesisNode: ParserFactory;
  export const createRangeNode: ParserFactory;
  export const createRelationalNode: ParserFactory;
  export const createSymbolNode: ParserFactory;
  export const createFunctionNode: ParserFactory;
  export const createParse: ParserFactory;
  export function config(): Record<string, unknown>;
}

/** mathjs's default configuration (a frozen copy; the parser reads its `number` and `numberFallback`). */
const PARSE_CONFIG: Readonly<Record<string, unknown>> = Object.freeze({
  ...config(),
});

/** Stands in for every dependency a node needs only to compile or evaluate: it refuses when called. */
function refusing(name: string): () => never {
  return () => {
    throw new Error(`Function ${name} is disabled`);
  };
}

/* The private parser: made on the first parse (a command that parses nothing, `--help`, never pays for
   it), from the parser's own factories and nothing else. Its typed-function and number conversion are
   mathjs's own; every dependency the nodes need only to compile or evaluate (subset, size, matrix, the
   result set, the function namespaces) is a refusing stub or an empty namespace, so no instance exists
   that could evaluate anything, and there is no configuration to alter. Building the whole dependency
   set of \`parse\` (create({ parseDependencies })) made up most of a fresh process's start-up and most of
   the bundles (docs/performance.md). */
let sealed: { parse: (text: string) => MathNode; readConfig: () => Record<string, unknown> } | null = null;

function privateInstance(): NonNullable<typeof sealed> {
  if (sealed) return sealed;
  const typed = createTyped({});
  const number = createNumber({ typed });
  const numeric = createNumeric({ number });
  const nothing = Object.freeze(Object.create(null) as object);
  const Node = createNode({ mathWithTransform: nothing });
  const d: Record<string, unknown> = {
    typed,
    numeric,
    config: PARSE_CONFIG,
    Node,
    math: nothing,
    subset: refusing('subset'),
    size: refusing('size'),
    matrix: refusing('matrix'),
    isBounded: refusing('isBounded'),
    ResultSet: refusing('ResultSet'),
  };
  d.AccessorNode = createAccessorNode(d);
  d.ArrayNode = createArrayNode(d);
  d.AssignmentNode = createAssignmentNode(d);
  d.BlockNode = createBlockNode(d);
  d.ConditionalNode = createConditionalNode(d);
  d.ConstantNode = createConstantNode(d);
  d.FunctionAssignmentNode = createFunctionAssignmentNode(d);
  d.IndexNode = createIndexNode(d);
  d.ObjectNode = createObjectNode(d);
  d.OperatorNode = createOperatorNode(d);
  d.ParenthesisNode = createParenthesisNode(d);
  d.RangeNode = createRangeNode(d);
  d.RelationalNode = createRelationalNode(d);
  d.SymbolNode = createSymbolNode(d);
  d.FunctionNode = createFunctionNode(d); // extends SymbolNode, so after it
  const parse = createParse(d) as (text: string) => MathNode;
  sealed = { parse, readConfig: () => ({ ...PARSE_CONFIG }) };
  return sealed;
}

/** Parses with the private instance (made on the first call). */
export function mathParse(text: string): MathNode {
  return privateInstance().parse(text);
}

/** A snapshot of the private instance's configuration (tests check it never changes). */
export function sandboxConfig(): Record<string, unknown> {
  return { ...privateInstance().readConfig() };
}

/** The parts of a mathjs node this module reads. */
export interface MathNode {
  type: string;
  [key: string]: unknown;
}

