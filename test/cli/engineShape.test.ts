/**
 * The hand-kept declarations of `require('eigenspan/engine')` (types/engine.d.ts) against what the built
 * engine (dist/engine.js) really returns. The engine casts its JSON to `EngineResult`, so the type
 * checker alone cannot see a field added, dropped or retyped at run time: here the declarations are read
 * with the TypeScript compiler, and real results of every kind of system are walked field by field.
 * Every field a result has must be declared with its type, every required field must be there, and every
 * declared field must turn up in at least one of the results below, so no documented field is unused.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import ts from 'typescript';
import type * as Declared from '../../types/engine';

const ROOT = join(__dirname, '..', '..');
const DECLARATIONS = join(ROOT, 'types', 'engine.d.ts');

/** A declared type, as far as a JSON value can show it. */
type Shape =
  | { kind: 'object'; props: Map<string, { optional: boolean; type: Shape }> }
  | { kind: 'array'; of: Shape }
  | { kind: 'union'; of: Shape[] }
  | { kind: 'number' | 'string' | 'null' | 'boolean' }
  | { kind: 'literal'; value: string | number };

/** Reads interface `name` of the declaration file, following the file's own interfaces and aliases. */
function declaredShape(name: string): Shape {
  const file = ts.createSourceFile(DECLARATIONS, readFileSync(DECLARATIONS, 'utf8'), ts.ScriptTarget.ES2022, true);
  const named = new Map<string, ts.InterfaceDeclaration | ts.TypeAliasDeclaration>();
  file.forEachChild((n) => {
    if (ts.isInterfaceDeclaration(n) || ts.isTypeAliasDeclaration(n)) named.set(n.name.text, n);
  });
  const members = (list: ts.NodeArray<ts.TypeElement>): Shape => {
    const props = new Map<string, { optional: boolean; type: Shape }>();
    for (const m of list) {
      if (!ts.isPropertySignature(m) || !m.type) throw new Error(`unexpected member ${m.getText()}`);
      props.set(m.name.getText(), { optional: m.questionToken !== undefined, type: shapeOf(m.type) });
    }
    return { kind: 'object', props };
  };
  const decl = (d: ts.InterfaceDeclaration | ts.TypeAliasDeclaration): Shape => (ts.isInterfaceDeclaration(d) ? members(d.members) : shapeOf(d.type));
  function shapeOf(t: ts.TypeNode): Shape {
    if (t.kind === ts.SyntaxKind.NumberKeyword) return { kind: 'number' };
    if (t.kind === ts.SyntaxKind.StringKeyword) return { kind: 'string' };
    if (t.kind === ts.SyntaxKind.BooleanKeyword) return { kind: 'boolean' };
    // A tuple as JSON is an array of its element types.
    if (ts.isTupleTypeNode(t)) return { kind: 'array', of: { kind: 'union', of: t.elements.map((e) => shapeOf(ts.isNamedTupleMember(e) ? e.type : e)) } };
    if (ts.isLiteralTypeNode(t)) {
      if (t.literal.kind === ts.SyntaxKind.NullKeyword) return { kind: 'null' };
      if (ts.isStringLiteral(t.literal)) return { kind: 'literal', value: t.literal.text };
      if (ts.isNumericLiteral(t.literal)) return { kind: 'literal', value: Number(t.literal.text) };
    }
    if (ts.isUnionTypeNode(t)) return { kind: 'union', of: t.types.map(shapeOf) };
    if (ts.isArrayTypeNode(t)) return { kind: 'array', of: shapeOf(t.elementType) };
    if (ts.isTypeLiteralNode(t)) return members(t.members);
    if (ts.isParenthesizedTypeNode(t)) return shapeOf(t.type);
    if (ts.isTypeReferenceNode(t) && named.has(t.typeName.getText())) return decl(named.get(t.typeName.getText())!);
    throw new Error(`the test does not read the type ${t.getText()}`);
  }
  const d = named.get(name);
  if (!d) throw new Error(`no ${name} in types/engine.d.ts`);
  return decl(d);
}

/** Problems of `value` against `shape`; `seen` collects the declared paths the value shows. */
function check(value: unknown, shape: Shape, path: string, seen: Set<string>): string[] {
  switch (shape.kind) {
    case 'number':
      return typeof value === 'number' ? [] : [`${path} is ${JSON.stringify(value)}, declared a number`];
    case 'string':
      return typeof value === 'string' ? [] : [`${path} is ${JSON.stringify(value)}, declared a string`];
    case 'boolean':
      return typeof value === 'boolean' ? [] : [`${path} is ${JSON.stringify(value)}, declared a boolean`];
    case 'null':
      return value === null ? [] : [`${path} is not null`];
    case 'literal':
      return value === shape.value ? [] : [`${path} is ${JSON.stringify(value)}, declared ${JSON.stringify(shape.value)}`];
    case 'union': {
      const tries = shape.of.map((member) => {
        const own = new Set<string>();
        return { seen: own, problems: check(value, member, path, own) };
      });
      const fit = tries.find((t) => t.problems.length === 0);
      if (!fit) return [`${path} fits none of the declared types: ${tries.map((t) => t.problems[0]).join('; ')}`];
      for (const p of fit.seen) seen.add(p);
      return [];
    }
    case 'array':
      if (!Array.isArray(value)) return [`${path} is not an array`];
      return value.flatMap((v, i) => check(v, shape.of, `${path}[]`, seen).map((p) => p.replace(`${path}[]`, `${path}[${i}]`)));
    case 'object': {
      if (typeof value !== 'object' || value === null || Array.isArray(value)) return [`${path} is not an object`];
      const o = value as Record<string, unknown>;
      const problems: string[] = [];
      for (const k of Object.keys(o)) if (!shape.props.has(k)) problems.push(`${path}.${k} is returned but not declared`);
      for (const [k, p] of shape.props) {
        if (!(k in o)) {
          if (!p.optional) problems.push(`${path}.${k} is declared but missing`);
          continue;
        }
        seen.add(`${path}.${k}`);
        problems.push(...check(o[k], p.type, `${path}.${k}`, seen));
      }
      return problems;
    }
  }
}

/** Every property path the shape declares (array elements as `[]`). */
function declaredPaths(shape: Shape, path: string): string[] {
  switch (shape.kind) {
    case 'object':
      return [...shape.props].flatMap(([k, p]) => [`${path}.${k}`, ...declaredPaths(p.type, `${path}.${k}`)]);
    case 'array':
      return declaredPaths(shape.of, `${path}[]`);
    case 'union':
      return shape.of.flatMap((s) => declaredPaths(s, path));
    default:
      return [];
  }
}

/** Setups that between them show every field: hard walls with an evolution, a finite well, an oscillator, a numerical potential, a failed file, a thermal mixture, a mass that depends on x, a sweep. */
const SETUPS = [
  'system box(0, 1)\nstate psi(x) = sqrt(30) x * (1 - x)\nbasis 10\nevolve to 1 steps 5\nexpect energy 4 +- 0.1\n',
  'units nm, meV\nsystem well(depth = 300 meV, width = 2 nm)\nstate gaussian(center = 0 nm, width = 0.5 nm)\n',
  'system oscillator(omega = 1)\nstate gaussian(center = 1, width = 0.8, momentum = 0.5)\nbasis 20\n',
  'system V(x) = x^4 / 4 over [-5, 5]\nstate psi(x) = exp(-x^2)\nbasis 8\n',
  'system V(x) = x < 0.5 ? 0 : 20 over [0, 1]\nstate psi(x) = sin(pi x)^2\nbasis 4\n',
  'system box(0, 1)\nstate psi(x) = y\n',
  'system oscillator(omega = 1)\nstate thermal(nbar = 0.5) of oscillator(omega = 1, center = 1)\nbasis 20\n',
  'system V(x) = abs(x) < 1 ? 0 : 5 over [-4, 4] with mass(x) = abs(x) < 1 ? 1 : 1.5\nstate psi(x) = exp(-x^2)\nbasis 3\n',
  // A sweep with bound-level steps, an expect flip and a design window.
  'let D = 5\nsystem well(depth = D, width = 2)\nstate gaussian(center = 0, width = 0.5)\nexpect weight 1 >= 0.95\nsweep D from 1 to 12 steps 7\nexpect window covers 2..12\n',
];

let engine: typeof Declared;
beforeAll(() => {
  const built = join(ROOT, 'dist', 'engine.js');
  if (!existsSync(built)) throw new Error('dist/engine.js is missing: run `npm run build` first');
  engine = createRequire(__filename)(built) as typeof Declared;
});

describe('types/engine.d.ts against the built engine', () => {
  it('declares every field of real results with its type, and every declared field occurs', () => {
    const shape = declaredShape('EngineResult');
    const seen = new Set<string>();
    for (const text of SETUPS) {
      // JSON is the contract: the object as a script would save or send it.
      const result: unknown = JSON.parse(JSON.stringify(engine.analyse(text)));
      expect(check(result, shape, 'result', seen), text).toEqual([]);
    }
    // A solver capped short (maxGridPoints 1/8 of its default): levels marked unresolved.
    const capped = 'mass 0.5\nsystem V(x) = x^2 over [-25, 25]\nstate gaussian(center = 1, width = 1)\nbasis 200\n';
    expect(check(JSON.parse(JSON.stringify(engine.analyse(capped, { limits: { maxGridPoints: 32768 } }))), shape, 'result', seen), capped).toEqual([]);
    expect(declaredPaths(shape, 'result').filter((p) => !seen.has(p))).toEqual([]);
  });

  it('the reader of the declarations can fail', () => {
    const shape = declaredShape('EngineLevel');
    const seen = new Set<string>();
    expect(check({ n: 1, energy: 2, re: 0, im: 0, weight: 1, extra: 1 }, shape, 'l', seen)).toEqual(['l.extra is returned but not declared']);
    expect(check({ n: 1, energy: 2, re: 0, im: 0 }, shape, 'l', seen)).toEqual(['l.weight is declared but missing']);
    expect(check({ n: '1', energy: 2, re: 0, im: 0, weight: 1 }, shape, 'l', seen)).toEqual(['l.n is "1", declared a number']);
  });
});
