/**
 * The untrusted pipeline (files of an untrusted workspace): syntax, name and dimension (unit) checks,
 * and nothing evaluated. No expression is compiled or run: each is parsed by the sandbox and its names
 * and dimensions are checked; a `let` name enters the scope with its checked dimension and, for the
 * checker's exponents and level numbers, the value the checker itself folds from plain arithmetic
 * (numbers, pi, e and + - * / ^ of earlier such names; anything else is unknown there).
 */
import { inQuickStage } from '../language/meter';
import type { EngineDiagnostic } from '../language/catalogue';
import { rejectedNames, type Arg, type Comparison, type Expectation, type ExprText, type QFile, type Statement, type StateSpec, type SystemSpec } from '../language/ast';
import type { Scope, UnitSystem } from '../expr/types';
import { parseExpression } from '../expr/sandbox';
import { checkExpression, foldReal } from '../expr/check';
import { createScope, makeUnitSystem } from '../expr/units';
import { dimensionOf, type ValueKind } from './dimensions';
import { readFile, sortDiagnostics, internalError } from './front';
import { resolveLimits, type AnalyseOptions, type Limits } from './options';

/** One expression of a statement and what it must be. */
interface Slot {
  src: ExprText;
  /** The kind of value expected (null: any dimension). */
  kind: ValueKind | null;
  what: string;
  /** Inside `V(x)` and `psi(x)`: the position x (and, in psi of a file with a system, phi). */
  hasX?: boolean;
  hasPhi?: boolean;
}

/** Syntax, name and unit checks of `text`, evaluating nothing. Never throws. */
export function analyseUntrusted(text: string, options: AnalyseOptions = {}): { file: QFile; diagnostics: EngineDiagnostic[] } {
  try {
    const limits = resolveLimits(options);
    const read = inQuickStage(text.length, () => {
      const r = readFile(text, limits);
      if (r.parsed) checkFile(r.file, limits, r.diagnostics);
      return r;
    });
    return { file: read.file, diagnostics: sortDiagnostics(read.diagnostics) };
  } catch (err) {
    return { file: { text, statements: [] }, diagnostics: [internalError(err, text)] };
  }
}

/** Checks every statement's expressions (the state last, once every `let` is known, as the model does). */
function checkFile(file: QFile, limits: Limits, out: EngineDiagnostic[]): void {
  const unitsStmt = file.statements.find((s) => s.kind === 'units');
  let units: UnitSystem = { mode: 'natural' };
  if (unitsStmt && unitsStmt.kind === 'units') {
    const u = makeUnitSystem(unitsStmt.units);
    out.push(...u.diagnostics);
    if (u.result) units = u.result;
  }
  const scope = createScope(units);
  // Later uses of a name whose `let` the parser rejected add nothing: it was reported where it was defined.
  const refused = rejectedNames(file);
  const push = (ds: EngineDiagnostic[]): void => {
    for (const d of ds) if (!((d.code === 'forbidden' || d.code === 'name') && refused.has(file.text.slice(d.start, d.end)))) out.push(d);
  };
  const hasSystem = file.statements.some((s) => s.kind === 'system');
  const parseOptions = { maxLength: limits.maxExpressionLength, maxDepth: limits.maxNesting };
  const check = (slot: Slot): void => {
    const p = parseExpression(slot.src, parseOptions);
    push(p.diagnostics);
    if (!p.result) return;
    const s: Scope = { ...scope, hasX: slot.hasX ?? false, hasPhi: slot.hasPhi ?? false };
    push(checkExpression(p.result, s, slot.kind === null ? null : dimensionOf(slot.kind, units), slot.what).diagnostics);
  };
  for (const stmt of file.statements) {
    if (stmt.kind === 'state') continue;
    if (stmt.kind !== 'let') {
      slotsOf(stmt).forEach(check);
      continue;
    }
    const p = parseExpression(stmt.expr, parseOptions);
    push(p.diagnostics);
    if (!p.result) continue;
    const checked = checkExpression(p.result, scope, null, `'${stmt.name}'`);
    push(checked.diagnostics);
    if (checked.dimension === null) continue;
    scope.values.set(stmt.name, { value: { re: foldReal(p.result, scope) ?? NaN, im: 0 }, dimension: checked.dimension, definedAt: stmt.nameSpan });
  }
  const state = file.statements.find((s) => s.kind === 'state');
  if (state && state.kind === 'state') stateSlots(state.state, hasSystem).forEach(check);
}

/** The expressions of a statement other than `let` and `state`. */
function slotsOf(stmt: Statement): Slot[] {
  switch (stmt.kind) {
    case 'mass':
      return [{ src: stmt.expr, kind: 'mass', what: 'the mass' }];
    case 'system':
      return systemSlots(stmt.system);
    case 'basis':
      return [{ src: stmt.expr, kind: 'dimensionless', what: 'the basis size' }];
    case 'evolve':
      return [{ src: stmt.to, kind: 'time', what: 'the evolution time' }, ...(stmt.steps ? [{ src: stmt.steps, kind: 'dimensionless' as const, what: 'the number of steps' }] : [])];
    case 'expect':
      return expectSlots(stmt.expectation);
    default:
      return [];
  }
}

function expectSlots(x: Expectation): Slot[] {
  switch (x.kind) {
    case 'parity':
      return [];
    case 'norm':
      return comparisonSlots(x.comparison, 'dimensionless', 'the expected norm');
    case 'energy':
    case 'spread':
      return comparisonSlots(x.comparison, 'energy', `the expected ${x.kind}`);
    case 'weight':
      return [
        { src: x.from, kind: 'dimensionless', what: 'the first level' },
        ...(x.to ? [{ src: x.to, kind: 'dimensionless' as const, what: 'the last level' }] : []),
        ...comparisonSlots(x.comparison, 'dimensionless', 'the expected weight'),
      ];
  }
}

function comparisonSlots(c: Comparison, kind: ValueKind, what: string): Slot[] {
  const value: Slot = { src: c.value, kind, what };
  return c.kind === 'tolerance' ? [value, { src: c.tolerance, kind, what: 'the tolerance' }] : [value];
}

/** The kinds of each named argument of the constructors (positional box ends are lengths). */
const ARGUMENTS: Record<string, Record<string, [ValueKind, string]>> = {
  box: { left: ['length', "the box's left end"], right: ['length', "the box's right end"] },
  well: { depth: ['energy', "the well's depth"], width: ['length', "the well's width"], center: ['length', "the well's centre"] },
  oscillator: {
    omega: ['angularFrequency', 'the angular frequency'],
    frequency: ['frequency', 'the frequency'],
    quantum: ['energy', 'the oscillator quantum'],
    center: ['length', "the oscillator's centre"],
  },
  gaussian: { center: ['length', "the packet's centre"], width: ['length', "the packet's width"], momentum: ['wavenumber', "the packet's momentum"] },
  thermal: { nbar: ['dimensionless', 'the mean occupation'], temperature: ['temperature', 'the temperature'] },
};

function argSlots(constructor: string, args: Arg[]): Slot[] {
  const table = ARGUMENTS[constructor] ?? {};
  const positional = constructor === 'box' ? ['left', 'right'] : [];
  let next = 0;
  return args.map((a) => {
    const name = a.name ?? positional[next++] ?? null;
    const known = name !== null && Object.prototype.hasOwnProperty.call(table, name) ? table[name]! : null;
    // An argument the constructor does not know is parsed and name-checked only (the parser reports it).
    return known ? { src: a.value, kind: known[0], what: known[1] } : { src: a.value, kind: null, what: 'the argument' };
  });
}

function systemSlots(spec: SystemSpec): Slot[] {
  if (spec.kind !== 'potential') return argSlots(spec.kind, spec.args);
  return [
    { src: spec.from, kind: 'length', what: "the interval's left end" },
    { src: spec.to, kind: 'length', what: "the interval's right end" },
    { src: spec.expr, kind: 'energy', what: 'the potential', hasX: true },
  ];
}

function stateSlots(spec: StateSpec, hasSystem: boolean): Slot[] {
  switch (spec.kind) {
    case 'psi':
      return [{ src: spec.expr, kind: null, what: 'the state', hasX: true, hasPhi: hasSystem }];
    case 'eigen':
      return [{ src: spec.level, kind: 'dimensionless', what: 'the level' }, ...systemSlots(spec.system)];
    case 'gaussian':
      return argSlots('gaussian', spec.args);
    case 'thermal':
      return [...argSlots('thermal', spec.args), ...systemSlots(spec.system)];
    case 'mixture':
      return spec.parts.flatMap((p) => [{ src: p.weight, kind: 'dimensionless' as const, what: 'the weight' }, ...stateSlots(p.state, hasSystem)]);
  }
}
