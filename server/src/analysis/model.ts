/**
 * From a parsed file to a checked model: every expression parsed in the sandbox, its names resolved,
 * its dimension checked, and constants evaluated to numbers in internal units (hbar = 1).
 * This is the static stage: cheap, run on every keystroke.
 */
import { rejectedNames, type Arg, type ExprText, type QFile, type Span, type Statement, type StateSpec, type SystemSpec } from '../language/ast';
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import type { Dimension, Expr, Scope, UnitSystem } from '../expr/types';
import { DEFAULT_PARSE_OPTIONS, parseExpression } from '../expr/sandbox';
import { forEachNode } from '../expr/walk';
import { checkExpression } from '../expr/check';
import { evaluateConstant, compileFunction } from '../expr/compile';
import { makeUnitSystem, createScope, formatDimension, sameDimension } from '../expr/units';
import { paramOf, type ConstructorName } from '../language/signatures';
import { dimensionOf, type ValueKind } from './dimensions';
import { SLOTS, toleranceSlot, type SlotSpec } from './slots';
import { energyOfFrequency, frequencyAsEnergy } from './frequencyEnergy';
import { capital, fmt } from './findings';
import { raiseHint, type CapName } from '../shared/limits';
import { gaussianFactors } from './narrow';
import { NODES_PER_SAMPLE, samplesModel } from './samples';
import { mixtureModel, thermalModel, type MixedHooks } from './mixedModel';

import type { ComparisonModel, ExpectModel, Model, ModelOptions, StateModel, SystemModel } from './modelTypes';
export type { ComparisonModel, ExpectModel, Model, ModelOptions, StateModel, SystemModel } from './modelTypes';


/**
 * Checks every statement of a parsed file and evaluates what can be evaluated without numerics.
 * Diagnostics are appended to `out`. Never throws.
 */
export function buildModel(file: QFile, options: ModelOptions, out: EngineDiagnostic[]): Model {
  const b = new ModelBuilder(file, options, out);
  return b.run();
}

class ModelBuilder {
  private units: UnitSystem = { mode: 'natural' };
  private scope!: Scope;
  private errors = 0;
  private readonly lets: Model['lets'] = new Map();
  /** Names rejected `let` lines tried to define (reported there once by the parser): their later uses add no finding. */
  private readonly refused: Set<string>;
  /** The parts of the model the statements fill in. */
  private readonly model: Pick<Model, 'mass' | 'system' | 'state' | 'basis' | 'expects' | 'evolve'>;
  /** `expect norm` lines whose value has a dimension: it must be that of the integral of |psi|^2. */
  private readonly dimensionalNorms: { stmt: Statement; dimension: Dimension; span: Span }[] = [];

  constructor(
    private readonly file: QFile,
    private readonly options: ModelOptions,
    private readonly out: EngineDiagnostic[],
  ) {
    this.model = { mass: 1, system: null, state: null, basis: { value: options.defaultBasis, stmt: null }, expects: [], evolve: null };
    this.refused = rejectedNames(file);
  }

  private push(d: EngineDiagnostic[]): void {
    for (const x of d) {
      if (this.refusedUse(x)) continue;
      this.out.push(x);
      if (x.severity === 'error') this.errors++;
    }
  }

  /** A finding on a later use of a name whose `let` was rejected (already reported where it was defined). */
  private refusedUse(d: EngineDiagnostic): boolean {
    return this.refused.size > 0 && (d.code === 'forbidden' || d.code === 'name') && this.refused.has(this.file.text.slice(d.start, d.end));
  }

  private error(code: Parameters<typeof diagnostic>[0], span: Span, message: string): void {
    this.push([diagnostic(code, span.start, span.end, message, { severity: 'error' })]);
  }

  run(): Model {
    const statements = this.file.statements;
    const unitsStmt = statements.find((s) => s.kind === 'units');
    if (unitsStmt && unitsStmt.kind === 'units') {
      const u = makeUnitSystem(unitsStmt.units);
      this.push(u.diagnostics);
      if (u.result) this.units = u.result;
    }
    this.scope = createScope(this.units);
    // A physical file defaults to the electron mass.
    const me = this.scope.values.get('m_e');
    if (this.units.mode === 'physical' && me) this.model.mass = me.value.re;
    for (const stmt of statements) this.statement(stmt);
    const stateStmt = statements.find((s) => s.kind === 'state');
    if (stateStmt && stateStmt.kind === 'state') {
      // A written system whose line failed was reported there: phi in the state is not a second finding.
      const written = statements.some((s) => s.kind === 'system') || (this.file.rejected ?? []).some((r) => r.keyword === 'system');
      const m = this.state(stateStmt.state, written);
      if (m) this.model.state = { model: m, stmt: stateStmt };
    }
    this.normDimensions();
    return { ...this.model, units: this.units, lets: this.lets, ok: this.errors === 0 };
  }

  /** One statement into the model (the state waits until the system, which `phi` needs, is known). */
  private statement(stmt: Statement): void {
    const m = this.model;
    switch (stmt.kind) {
      case 'units':
      case 'state':
        return;
      case 'mass': {
        const v = this.slot(stmt.expr, SLOTS.mass);
        if (v === null) return;
        if (!(v > 0) || !Number.isFinite(v)) this.error('evaluation', stmt.expr, 'The mass must be positive and finite.');
        else m.mass = v;
        return;
      }
      case 'let':
        return this.let(stmt);
      case 'system': {
        const sys = this.system(stmt.system);
        if (sys) m.system = { model: sys, stmt };
        return;
      }
      case 'basis': {
        const n = this.integer(stmt.expr, SLOTS.basis, 1, this.options.maxBasis);
        if (n !== null) m.basis = { value: n, stmt };
        return;
      }
      case 'expect': {
        const x = this.expect(stmt);
        if (x) m.expects.push(x);
        return;
      }
      case 'evolve': {
        const t = this.slot(stmt.to, SLOTS.evolveTime);
        let steps = 200;
        if (stmt.steps) {
          const k = this.integer(stmt.steps, SLOTS.evolveSteps, 1, this.options.maxEvolveSteps, 'maxEvolveSteps');
          if (k !== null) steps = k;
        }
        if (t === null) return;
        if (!(t > 0) || !Number.isFinite(t)) this.error('evaluation', stmt.to, 'The evolution time must be positive and finite.');
        else m.evolve = { to: t, steps, stmt };
        return;
      }
    }
  }

  /** A `let`: the name gets its value (the parser has already refused reserved names). */
  private let(stmt: Extract<Statement, { kind: 'let' }>): void {
    const e = this.expr(stmt.expr);
    // evaluateConstant checks names and dimensions itself (no dimension is expected of a `let`).
    const v = e ? evaluateConstant(e, this.scope) : null;
    if (v) this.push(v.diagnostics);
    if (!v?.result) {
      // Its value failed and was reported here: later uses of the name add nothing.
      this.refused.add(stmt.name);
      return;
    }
    this.scope.values.set(stmt.name, { value: v.result.value, dimension: v.result.dimension, definedAt: stmt.nameSpan });
    this.lets.set(stmt.name, { value: v.result.value, dimension: v.result.dimension, span: stmt.nameSpan, valueSpan: stmt.expr });
  }

  private expr(src: ExprText): Expr | null {
    const p = parseExpression(src, { maxLength: this.options.maxExpressionLength ?? DEFAULT_PARSE_OPTIONS.maxLength, maxDepth: this.options.maxNesting ?? DEFAULT_PARSE_OPTIONS.maxDepth });
    this.push(p.diagnostics);
    return p.result;
  }

  /** The value of argument `name` of constructor `c`, checked against the dimension its signature gives it. */
  private argument(c: ConstructorName, name: string, src: ExprText): number | null {
    const p = paramOf(c, name);
    return p ? this.constant(src, p.kind, p.what) : null;
  }

  /**
   * Parses, checks and evaluates a constant of the given kind; returns its real value or null. The
   * names and dimension are checked once, inside `evaluateConstant`; `checkExpression` runs again only
   * to word a dimension that differs from the one expected (a literal 0 fits any and passes there).
   */
  private constant(src: ExprText, kind: ValueKind, what: string): number | null {
    const e = this.expr(src);
    if (!e) return null;
    const v = evaluateConstant(e, this.scope);
    this.push(v.diagnostics);
    if (!v.result) return null;
    const expected = dimensionOf(kind, this.units);
    const asEnergy = frequencyAsEnergy(kind, v.result.dimension, this.units);
    if (this.units.mode === 'physical' && !asEnergy && !sameDimension(v.result.dimension, expected)) {
      const worded = checkExpression(e, this.scope, expected, what).diagnostics;
      this.push(worded);
      if (worded.some((d) => d.severity === 'error')) return null;
    }
    const { re, im } = v.result.value;
    if (Math.abs(im) > 1e-12 * Math.max(1, Math.abs(re))) {
      this.error('evaluation', src, `${capital(what)} must be real, but it is complex (${fmt(re)} + ${fmt(im)} i).`);
      return null;
    }
    if (asEnergy) return energyOfFrequency(re);
    return kind === 'frequency' ? re * 2 * Math.PI : re;
  }

  /** The value of a statement slot (slots.ts), checked against the dimension given there. */
  private slot(src: ExprText, s: SlotSpec): number | null {
    return this.constant(src, s.kind, s.what);
  }

  private integer(src: ExprText, s: SlotSpec, min: number, max: number, cap: CapName = 'maxBasis'): number | null {
    const what = s.what;
    const v = this.constant(src, s.kind, what);
    if (v === null) return null;
    if (!Number.isInteger(v)) {
      this.error('evaluation', src, `${capital(what)} must be a whole number, not ${fmt(v)}.`);
      return null;
    }
    if (v < min) {
      this.error('evaluation', src, `${capital(what)} must be at least ${min}.`);
      return null;
    }
    if (v > max) {
      this.error('limits', src, `${capital(what)} ${v} is above the limit of ${max}.${raiseHint(cap)}`);
      return null;
    }
    return v;
  }

  private args(args: Arg[]): Map<string, Arg> {
    const m = new Map<string, Arg>();
    for (const a of args) if (a.name) m.set(a.name, a);
    return m;
  }

  private system(spec: SystemSpec): SystemModel | null {
    switch (spec.kind) {
      case 'box':
        return this.box(spec);
      case 'well':
        return this.well(spec);
      case 'oscillator':
        return this.oscillator(spec);
      case 'potential':
        return this.potential(spec);
    }
  }

  private box(spec: Extract<SystemSpec, { kind: 'box' }>): SystemModel | null {
    const pos = spec.args.filter((a) => a.name === null);
    const named = this.args(spec.args);
    const aArg = pos[0] ?? named.get('left');
    const bArg = pos[1] ?? named.get('right');
    if (!aArg || !bArg) return null;
    const a = this.argument('box', 'left', aArg.value);
    const b = this.argument('box', 'right', bArg.value);
    if (a === null || b === null) return null;
    if (!(b > a)) {
      this.error('evaluation', spec.span, `The box's right end (${fmt(b)}) must lie to the right of its left end (${fmt(a)}).`);
      return null;
    }
    return { kind: 'box', a, b, span: spec.span };
  }

  private well(spec: Extract<SystemSpec, { kind: 'well' }>): SystemModel | null {
    const named = this.args(spec.args);
    const d = named.get('depth');
    const w = named.get('width');
    if (!d || !w) return null;
    const depth = this.argument('well', 'depth', d.value);
    const width = this.argument('well', 'width', w.value);
    const c = named.get('center');
    const center = c ? this.argument('well', 'center', c.value) : 0;
    if (depth === null || width === null || center === null) return null;
    if (!(depth > 0)) {
      this.error('evaluation', d.value, `The well's depth must be positive (it is the potential outside the well), not ${fmt(depth)}.`);
      return null;
    }
    if (!(width > 0)) {
      this.error('evaluation', w.value, `The well's width must be positive, not ${fmt(width)}.`);
      return null;
    }
    const bm = named.get('barrier_mass');
    const barrierMass = bm ? this.argument('well', 'barrier_mass', bm.value) : undefined;
    if (barrierMass === null) return null;
    if (barrierMass !== undefined && !(barrierMass > 0 && Number.isFinite(barrierMass))) {
      this.error('evaluation', bm!.value, `The barrier mass must be positive and finite, not ${fmt(barrierMass)}.`);
      return null;
    }
    return { kind: 'well', depth, width, center, span: spec.span, ...(barrierMass !== undefined ? { barrierMass } : {}) };
  }

  private oscillator(spec: Extract<SystemSpec, { kind: 'oscillator' }>): SystemModel | null {
    const named = this.args(spec.args);
    let omega: number | null = null;
    const o = named.get('omega');
    const f = named.get('frequency');
    const q = named.get('quantum');
    const given = o ?? f ?? q;
    if (!given) return null;
    if (o) omega = this.argument('oscillator', 'omega', o.value);
    else if (f) omega = this.argument('oscillator', 'frequency', f.value);
    else if (q) omega = this.argument('oscillator', 'quantum', q.value); // hbar = 1 internally
    const c = named.get('center');
    const center = c ? this.argument('oscillator', 'center', c.value) : 0;
    if (omega === null || center === null) return null;
    if (!(omega > 0)) {
      this.error('evaluation', given.value, `The oscillator's frequency must be positive, not ${fmt(omega)}.`);
      return null;
    }
    return { kind: 'oscillator', omega, center, span: spec.span };
  }

  private potential(spec: Extract<SystemSpec, { kind: 'potential' }>): SystemModel | null {
    const a = this.slot(spec.from, SLOTS.intervalLeft);
    const b = this.slot(spec.to, SLOTS.intervalRight);
    const e = this.expr(spec.expr);
    if (!e) return null;
    const scope: Scope = { ...this.scope, hasX: true, hasPhi: false };
    const checked = checkExpression(e, scope, dimensionOf(SLOTS.potential.kind, this.units), SLOTS.potential.what);
    this.push(checked.diagnostics);
    if (checked.dimension === null || a === null || b === null) return null;
    if (!(b > a)) {
      this.error('evaluation', spec.span, `The interval's right end (${fmt(b)}) must lie to the right of its left end (${fmt(a)}).`);
      return null;
    }
    const c = compileFunction(e, scope);
    this.push(c.diagnostics);
    if (!c.result) return null;
    const sys: SystemModel = { kind: 'potential', V: c.result, a, b, span: spec.span, exprSpan: spec.expr, key: potentialKey(spec.expr.text, e, scope) };
    if (spec.walls) sys.hard = [spec.walls.left === 'hard', spec.walls.right === 'hard'];
    return spec.mass ? this.massProfile(sys, spec.mass, scope) : sys;
  }

  /** `with mass(x) = ...`: checked as a mass in x, compiled, and made part of the potential's key. */
  private massProfile(sys: Extract<SystemModel, { kind: 'potential' }>, src: ExprText, scope: Scope): SystemModel | null {
    const e = this.expr(src);
    if (!e) return null;
    const checked = checkExpression(e, scope, dimensionOf(SLOTS.massProfile.kind, this.units), SLOTS.massProfile.what);
    this.push(checked.diagnostics);
    if (checked.dimension === null) return null;
    const c = compileFunction(e, scope);
    this.push(c.diagnostics);
    if (!c.result) return null;
    return { ...sys, massFn: c.result, massSpan: src, key: `${sys.key}|mass|${potentialKey(src.text, e, scope)}` };
  }

  private state(spec: StateSpec, hasSystem: boolean): StateModel | null {
    switch (spec.kind) {
      case 'psi': {
        const e = this.expr(spec.expr);
        if (!e) return null;
        const scope: Scope = { ...this.scope, hasX: true, hasPhi: hasSystem };
        const checked = checkExpression(e, scope, null, 'the state');
        this.push(checked.diagnostics);
        if (checked.dimension === null) return null;
        // phi(n, x) needs the system's levels, which a failed system line does not give.
        if (this.model.system === null && usesName(e, 'phi')) return null;
        const c = compileFunction(e, scope);
        this.push(c.diagnostics);
        if (!c.result) return null;
        return { kind: 'psi', fn: c.result, expr: spec.expr, usesPhi: usesName(e, 'phi'), dimension: checked.dimension, peaks: gaussianFactors(e, scope) };
      }
      case 'eigen': {
        const level = this.integer(spec.level, SLOTS.eigenLevel, 0, this.options.maxBasis);
        const system = this.system(spec.system);
        // Whether the level exists (and the system's first label) is a fact of its basis, checked when it is built.
        if (level === null || system === null) return null;
        return { kind: 'eigen', level, levelSpan: spec.level, system };
      }
      case 'gaussian': {
        const named = this.args(spec.args);
        const c = named.get('center');
        const w = named.get('width');
        const k = named.get('momentum');
        if (!c || !w) return null;
        const center = this.argument('gaussian', 'center', c.value);
        const width = this.argument('gaussian', 'width', w.value);
        const momentum = k ? this.argument('gaussian', 'momentum', k.value) : 0;
        if (center === null || width === null || momentum === null) return null;
        if (!(width > 0)) {
          this.error('evaluation', w.value, `The packet's width must be positive, not ${fmt(width)}.`);
          return null;
        }
        return { kind: 'gaussian', center, width, momentum };
      }
      case 'samples': {
        if (this.options.data === undefined) return null;
        const rows = Math.floor((this.options.maxGridPoints ?? 1 << 18) / NODES_PER_SAMPLE) - 1;
        const found: EngineDiagnostic[] = [];
        const m = samplesModel(spec, this.options.data, this.units, rows, found);
        this.push(found);
        return m;
      }
      case 'thermal':
        return thermalModel(spec, this.mixedHooks(hasSystem));
      case 'mixture':
        return mixtureModel(spec, this.mixedHooks(hasSystem));
    }
  }

  /** The evaluators the mixed states (mixedModel.ts) borrow. */
  private mixedHooks(hasSystem: boolean): MixedHooks {
    return {
      units: this.units,
      constant: (src, kind, what) => this.constant(src, kind, what),
      system: (spec) => this.system(spec),
      state: (spec) => this.state(spec, hasSystem),
      error: (code, span, message) => this.error(code, span, message),
    };
  }

  /** A comparison of the slot's kind (slots.ts), or of any dimension (`null`, the tolerance then has the value's). */
  private comparison(c: import('../language/ast').Comparison, s: SlotSpec | null): ComparisonModel | null {
    if (s === null) return this.anyComparison(c);
    const value = this.slot(c.value, s);
    if (value === null) return null;
    if (c.kind === 'tolerance') {
      const tol = this.slot(c.tolerance, toleranceSlot(s));
      if (tol === null) return null;
      if (!(tol >= 0)) {
        this.error('evaluation', c.tolerance, 'The tolerance must not be negative.');
        return null;
      }
      return { kind: 'tolerance', value, tolerance: tol, valueText: c.value };
    }
    return { kind: c.kind, value, tolerance: 0, valueText: c.value };
  }

  /** The dimension of a constant value (null when it cannot be evaluated; reported by the caller's own pass). */
  private dimensionOfValue(src: ExprText): Dimension | null {
    const e = parseExpression(src, DEFAULT_PARSE_OPTIONS);
    if (!e.result) return null;
    const v = evaluateConstant(e.result, this.scope);
    return v.result ? v.result.dimension : null;
  }

  /** A comparison whose value may have any dimension; the tolerance must have the value's. */
  private anyComparison(c: import('../language/ast').Comparison): ComparisonModel | null {
    const e = this.expr(c.value);
    if (!e) return null;
    const v = evaluateConstant(e, this.scope);
    this.push(v.diagnostics);
    if (!v.result) return null;
    const value = v.result.value.re;
    if (c.kind !== 'tolerance') return { kind: c.kind, value, tolerance: 0, valueText: c.value };
    const t = this.expr(c.tolerance);
    if (!t) return null;
    const checked = checkExpression(t, this.scope, v.result.dimension, 'the tolerance');
    this.push(checked.diagnostics);
    const tv = evaluateConstant(t, this.scope);
    if (checked.dimension === null || !tv.result) return null;
    if (!(tv.result.value.re >= 0)) {
      this.error('evaluation', c.tolerance, 'The tolerance must not be negative.');
      return null;
    }
    return { kind: 'tolerance', value, tolerance: tv.result.value.re, valueText: c.value };
  }

  /**
   * `expect norm 6.25 nm`: the integral of |psi|^2 has the dimension of |psi|^2 times a length, so a
   * dimensionless formula in a file with units has a length for its norm; any other dimension is refused.
   * States given normalised (gaussian, eigen) have a dimensionless norm.
   */
  private normDimensions(): void {
    if (this.dimensionalNorms.length === 0) return;
    const state = this.model.state?.model;
    const length = dimensionOf('length', this.units);
    const psi = state?.kind === 'psi' ? state.dimension ?? null : null;
    // Without a checked state there is nothing to compare with (its own findings say why).
    if (state === undefined) return;
    const want: Dimension = psi ? [2 * psi[0] + length[0], 2 * psi[1], 2 * psi[2], 2 * psi[3]] : dimensionOf('dimensionless', this.units);
    for (const n of this.dimensionalNorms) {
      if (sameDimension(n.dimension, want)) {
        const x = this.model.expects.find((e) => e.stmt === n.stmt);
        if (x?.kind === 'norm' && this.units.mode === 'physical') x.unit = normUnit(want, this.units.length.name);
        continue;
      }
      this.model.expects = this.model.expects.filter((x) => x.stmt !== n.stmt);
      const what = `the integral of |psi|^2 has the dimension ${formatDimension(want)}`;
      this.push([diagnostic('units', n.span.start, n.span.end, `The expected norm has the dimension ${formatDimension(n.dimension)}, but ${what}; give a plain number or a value of that dimension.`, { severity: 'error' })]);
    }
  }

  private expect(stmt: Statement): ExpectModel | null {
    if (stmt.kind !== 'expect') return null;
    const x = stmt.expectation;
    switch (x.kind) {
      case 'parity':
        return { kind: 'parity', stmt, value: x.value };
      case 'window':
        // Judged over the whole sweep (analysis/sweep/), not at the let's own value.
        return null;
      case 'norm': {
        // A value with a dimension is checked against the state's once the state is known (`normDimensions`).
        const dim = this.units.mode === 'physical' ? this.dimensionOfValue(x.comparison.value) : null;
        if (dim !== null && !sameDimension(dim, dimensionOf('dimensionless', this.units))) {
          const c = this.comparison(x.comparison, null);
          if (c) this.dimensionalNorms.push({ stmt, dimension: dim, span: x.comparison.value });
          return c ? { kind: 'norm', stmt, comparison: c } : null;
        }
        const c = this.comparison(x.comparison, SLOTS.expectNorm);
        return c ? { kind: 'norm', stmt, comparison: c } : null;
      }
      case 'level': {
        const level = this.integer(x.level, SLOTS.expectLevel, 0, this.options.maxBasis);
        const c = this.comparison(x.comparison, SLOTS.expectLevelEnergy);
        return level !== null && c ? { kind: 'level', stmt, level, comparison: c } : null;
      }
      case 'continuum': {
        const c = this.comparison(x.comparison, SLOTS.expectContinuum);
        return c ? { kind: 'continuum', stmt, comparison: c } : null;
      }
      case 'revival': {
        const c = this.comparison(x.comparison, SLOTS.expectRevival);
        return c ? { kind: 'revival', stmt, comparison: c } : null;
      }
      case 'mean': {
        const time = this.slot(x.time, SLOTS.expectMeanTime);
        const c = this.comparison(x.comparison, x.observable === 'x' ? SLOTS.expectMeanX : SLOTS.expectMeanP);
        if (time === null || c === null) return null;
        if (!(time >= 0) || !Number.isFinite(time)) {
          this.error('evaluation', x.time, 'The time must be zero or positive and finite.');
          return null;
        }
        return { kind: 'mean', stmt, observable: x.observable, time, comparison: c };
      }
      case 'energy':
      case 'spread': {
        const c = this.comparison(x.comparison, x.kind === 'energy' ? SLOTS.expectEnergy : SLOTS.expectSpread);
        return c ? { kind: x.kind, stmt, comparison: c } : null;
      }
      case 'weight': {
        const from = this.integer(x.from, SLOTS.expectWeightFrom, 0, this.options.maxBasis);
        const to = x.to ? this.integer(x.to, SLOTS.expectWeightTo, 0, this.options.maxBasis) : from;
        const c = this.comparison(x.comparison, SLOTS.expectWeight);
        if (from === null || to === null || c === null) return null;
        if (to < from) {
          this.error('evaluation', x.to ?? x.from, `The level range ${from}..${to} is empty.`);
          return null;
        }
        return { kind: 'weight', stmt, from, to, comparison: c };
      }
    }
  }
}

/** The unit a dimensional norm is measured in: a power of the file's length unit, or the dimension in words. */
function normUnit(dim: Dimension, length: string): string {
  if (Math.abs(dim[1]) + Math.abs(dim[2]) + Math.abs(dim[3]) > 1e-9) return formatDimension(dim);
  return Math.abs(dim[0] - 1) < 1e-9 ? length : `${length}^${fmt(dim[0])}`;
}

/** True when the expression mentions `name` as a symbol or a call. */
export function usesName(e: Expr, name: string): boolean {
  let found = false;
  forEachNode(e, (n) => {
    if ((n.type === 'symbol' || n.type === 'call') && n.name === name) found = true;
  });
  return found;
}

/** The names an expression refers to (symbols and called functions). */
function namesOf(e: Expr, into: Set<string>): Set<string> {
  forEachNode(e, (n) => {
    if (n.type === 'symbol' || n.type === 'call') into.add(n.name);
  });
  return into;
}

/** Key of a potential: its text, the unit system and the internal values of every name it uses. */
function potentialKey(text: string, e: Expr, scope: Scope): string {
  const used: [string, number, number][] = [];
  for (const name of [...namesOf(e, new Set())].sort()) {
    const v = scope.values.get(name);
    if (v) used.push([name, v.value.re, v.value.im]);
  }
  return JSON.stringify([text, scope.units, used]);
}
