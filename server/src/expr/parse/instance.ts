/**
 * The private mathjs instance: built from the parser's factories alone, its parser captured, then every
 * entry point that parses, compiles, evaluates or alters the instance replaced by a throwing stub and
 * `config` made read-only. Only `mathParse` leaves this module; user text is never evaluated by mathjs.
 */
import { create, parseDependencies } from 'mathjs';

/**
 * mathjs functions its security guidance says to disable, plus every other entry point that parses,
 * compiles, evaluates or alters the instance. They are refused as calls and as bare names, and are
 * replaced by throwing stubs inside the private instance.
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

/* The private instance: created on the first parse (a command that parses nothing, `--help`, never
   pays for it), its parser captured, then its dangerous functions replaced. It is built from the
   parser's factories alone: the sandbox only parses, and creating every mathjs function made up most of
   the start-up time and of the bundles (docs/performance.md). */
let sealed: { parse: (text: string) => MathNode; readConfig: () => Record<string, unknown> } | null = null;

function privateInstance(): NonNullable<typeof sealed> {
  if (sealed) return sealed;
  const instance = create({ parseDependencies }, {});
  const parse = instance.parse as unknown as (text: string) => MathNode;
  const stubs: Record<string, () => never> = {};
  for (const name of DISABLED_FUNCTIONS) {
    // `config` and `typed` are instance internals that mathjs does not let import replace: `config` is
    // made read-only below, and the whitelist keeps both out of reach of expressions.
    if (name === 'config' || name === 'typed') continue;
    stubs[name] = () => {
      throw new Error(`Function ${name} is disabled`);
    };
  }
  instance.import(stubs, { override: true });
  /* `config` cannot be replaced through import; the instance's own function is swapped for one that only
     reads, so not even code holding the instance can change the parser's number type. */
  const readConfig = (instance.config as unknown as (o?: unknown) => Record<string, unknown>).bind(instance);
  Object.defineProperty(instance, 'config', {
    value: (options?: unknown) => {
      if (options !== undefined) throw new Error('Function config is disabled');
      return readConfig();
    },
    writable: false,
    configurable: false,
  });
  sealed = { parse, readConfig };
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

