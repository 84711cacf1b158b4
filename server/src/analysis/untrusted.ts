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
import { paramOf, SIGNATURES, type ConstructorName } from '../language/signatures';
import { dimensionOf, type ValueKind } from './dimensions';
import { frequencyAsEnergy } from './frequencyEnergy';
import { readFile, sortDiagnostics, internalError } from './front';
import { resolveLimits, type AnalyseOptions, type Limits } from './options';
import { checkSweepsUntrusted } from './sweep/untrusted';

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
  // A system line that failed was reported there: phi in the state is not a second finding.
  const hasSystem = file.statements.some((s) => s.kind === 'system') || (file.rejected ?? []).some((r) => r.keyword === 'system');
  const parseOptions = { maxLength: limits.maxExpressionLength, maxDepth: limits.maxNesting };
  const check = (slot: Slot): void => {
    const p = parseExpression(slot.src, parseOptions);
    push(p.diagnostics);
    if (!p.result) return;
    const s: Scope = { ...scope, hasX: slot.hasX ?? false, hasPhi: slot.hasPhi ?? false };
    const checked = checkExpression(p.result, s, slot.kind === null ? null : dimensionOf(slot.kind, units), slot.what);
    // A frequency where a constant energy is expected stands for E = h f (frequencyEnergy.ts), as in the model.
    if (!slot.hasX && checked.diagnostics.some((d) => d.code === 'units')) {
      const free = checkExpression(p.result, s, null, slot.what);
      if (free.dimension !== null && frequencyAsEnergy(slot.kind, free.dimension, units)) return push(free.diagnostics);
    }
    push(checked.diagnostics);
  };
  for (const stmt of file.statements) {
    if (stmt.kind === 'state') continue;
    if (stmt.kind !== 'let') {
      slotsOf(stmt).forEach(check);
      continue;
    }
    const p = parseExpression(stmt.expr, parseOptions);
    push(p.diagnostics);
    // A `let` whose value failed was reported there: later uses of its name add nothing.
    if (!p.result) {
      refused.add(stmt.name);
      continue;
    }
    const checked = checkExpression(p.result, scope, null, `'${stmt.name}'`);
    push(checked.diagnostics);
    if (checked.dimension === null) {
      refused.add(stmt.name);
      continue;
    }
    scope.values.set(stmt.name, { value: { re: foldReal(p.result, scope) ?? NaN, im: 0 }, dimension: checked.dimension, definedAt: stmt.nameSpan });
  }
  const state = file.statements.find((s) => s.kind === 'state');
  if (state && state.kind === 'state') stateSlots(state.state, hasSystem).forEach(check);
  checkSweepsUntrusted(file, scope, parseOptions, push);
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
    case 'window':
      return [];
    case 'norm':
      // A dimensionless number, or the dimension of the integral of |psi|^2, which the checked model knows.
      return comparisonSlots(x.comparison, null, 'the expected norm');
    case 'energy':
    case 'spread':
      return comparisonSlots(x.comparison, 'energy', `the expected ${x.kind}`);
    case 'weight':
      return [
        { src: x.from, kind: 'dimensionless', what: 'the first level' },
        ...(x.to ? [{ src: x.to, kind: 'dimensionless' as const, what: 'the last level' }] : []),
        ...comparisonSlots(x.comparison, 'dimensionless', 'the expected weight'),
      ];
    case 'level':
      return [{ src: x.level, kind: 'dimensionless', what: 'the level' }, ...comparisonSlots(x.comparison, 'energy', "the expected level's energy")];
    case 'continuum':
      return comparisonSlots(x.comparison, 'dimensionless', 'the expected continuum weight');
    case 'revival':
      return comparisonSlots(x.comparison, 'time', 'the expected revival time');
    case 'mean':
      return [
        { src: x.time, kind: 'time', what: 'the time' },
        ...comparisonSlots(x.comparison, x.observable === 'x' ? 'length' : 'wavenumber', `the expected mean ${x.observable}`),
      ];
  }
}

function comparisonSlots(c: Comparison, kind: ValueKind | null, what: string): Slot[] {
  const value: Slot = { src: c.value, kind, what };
  return c.kind === 'tolerance' ? [value, { src: c.tolerance, kind, what: 'the tolerance' }] : [value];
}

/** The slots of a constructor's arguments, each with its dimension and words from its signature. */
function argSlots(constructor: ConstructorName, args: Arg[]): Slot[] {
  const sig = SIGNATURES[constructor];
  let next = 0;
  return args.map((a) => {
    const name = a.name ?? (sig.positional ? sig.params[next++]?.name : undefined) ?? null;
    const p = name === null ? undefined : paramOf(constructor, name);
    // An argument the constructor does not know is parsed and name-checked only (the parser reports it).
    return p ? { src: a.value, kind: p.kind, what: p.what } : { src: a.value, kind: null, what: 'the argument' };
  });
}

function systemSlots(spec: SystemSpec): Slot[] {
  if (spec.kind !== 'potential') return argSlots(spec.kind, spec.args);
  return [
    { src: spec.from, kind: 'length', what: "the interval's left end" },
    { src: spec.to, kind: 'length', what: "the interval's right end" },
    { src: spec.expr, kind: 'energy', what: 'the potential', hasX: true },
    ...(spec.mass ? [{ src: spec.mass, kind: 'mass' as const, what: 'the mass', hasX: true }] : []),
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
    case 'samples':
      // A path, not an expression: nothing to check, and an untrusted workspace reads no data file.
      return [];
    case 'thermal':
      return [...argSlots('thermal', spec.args), ...systemSlots(spec.system)];
    case 'mixture':
      return spec.parts.flatMap((p) => [{ src: p.weight, kind: 'dimensionless' as const, what: 'the weight' }, ...stateSlots(p.state, hasSystem)]);
  }
}
