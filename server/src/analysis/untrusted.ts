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
import { SLOTS, toleranceSlot, type SlotSpec } from './slots';
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
  /** With `kind` null: the value must have the dimension of this expression (a norm's tolerance, the norm's). */
  like?: ExprText;
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
    const like = slot.like ? parseExpression(slot.like, parseOptions).result : null;
    const want = slot.kind !== null ? dimensionOf(slot.kind, units) : like ? checkExpression(like, s, null, slot.what).dimension : null;
    // A value the reference's own finding already covers (its dimension unknown) is not judged against it.
    if (slot.like && want === null) return push(checkExpression(p.result, s, null, slot.what).diagnostics);
    const checked = checkExpression(p.result, s, want, slot.what);
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
      return [at(stmt.expr, SLOTS.mass)];
    case 'system':
      return systemSlots(stmt.system);
    case 'basis':
      return [at(stmt.expr, SLOTS.basis)];
    case 'evolve':
      return [at(stmt.to, SLOTS.evolveTime), ...(stmt.steps ? [at(stmt.steps, SLOTS.evolveSteps)] : [])];
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
      return comparisonSlots(x.comparison, null);
    case 'energy':
    case 'spread':
      return comparisonSlots(x.comparison, x.kind === 'energy' ? SLOTS.expectEnergy : SLOTS.expectSpread);
    case 'weight':
      return [
        at(x.from, SLOTS.expectWeightFrom),
        ...(x.to ? [at(x.to, SLOTS.expectWeightTo)] : []),
        ...comparisonSlots(x.comparison, SLOTS.expectWeight),
      ];
    case 'level':
      return [at(x.level, SLOTS.expectLevel), ...comparisonSlots(x.comparison, SLOTS.expectLevelEnergy)];
    case 'continuum':
      return comparisonSlots(x.comparison, SLOTS.expectContinuum);
    case 'revival':
      return comparisonSlots(x.comparison, SLOTS.expectRevival);
    case 'mean':
      return [
        at(x.time, SLOTS.expectMeanTime),
        ...comparisonSlots(x.comparison, x.observable === 'x' ? SLOTS.expectMeanX : SLOTS.expectMeanP),
      ];
  }
}

/** The value and the tolerance of a comparison of the slot's kind, or of any dimension (`null`: the norm, which the model checks against the state's). */
function comparisonSlots(c: Comparison, s: SlotSpec | null): Slot[] {
  const value: Slot = s ? at(c.value, s) : { src: c.value, kind: null, what: SLOTS.expectNorm.what };
  if (c.kind !== 'tolerance') return [value];
  return [value, s ? at(c.tolerance, toleranceSlot(s)) : { src: c.tolerance, kind: null, what: toleranceSlot(SLOTS.expectNorm).what, like: c.value }];
}

/** The expression `src` in a statement slot (slots.ts). */
function at(src: ExprText, s: SlotSpec, inX: { hasX?: boolean; hasPhi?: boolean } = {}): Slot {
  return { src, kind: s.kind, what: s.what, ...inX };
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
    at(spec.from, SLOTS.intervalLeft),
    at(spec.to, SLOTS.intervalRight),
    at(spec.expr, SLOTS.potential, { hasX: true }),
    ...(spec.mass ? [at(spec.mass, SLOTS.massProfile, { hasX: true })] : []),
  ];
}

function stateSlots(spec: StateSpec, hasSystem: boolean): Slot[] {
  switch (spec.kind) {
    case 'psi':
      return [{ src: spec.expr, kind: null, what: 'the state', hasX: true, hasPhi: hasSystem }];
    case 'eigen':
      return [at(spec.level, SLOTS.eigenLevel), ...systemSlots(spec.system)];
    case 'gaussian':
      return argSlots('gaussian', spec.args);
    case 'samples':
      // A path, not an expression: nothing to check, and an untrusted workspace reads no data file.
      return [];
    case 'thermal':
      return [...argSlots('thermal', spec.args), ...systemSlots(spec.system)];
    case 'mixture':
      return spec.parts.flatMap((p) => [at(p.weight, SLOTS.mixtureWeight), ...stateSlots(p.state, hasSystem)]);
  }
}
