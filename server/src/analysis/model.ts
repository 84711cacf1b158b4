/**
 * From a parsed file to a checked model: every expression parsed in the sandbox, its names resolved,
 * its dimension checked, and constants evaluated to numbers in internal units (hbar = 1).
 * This is the static stage: cheap, run on every keystroke.
 */
import { rejectedNames, type Arg, type ExprText, type QFile, type Span, type Statement, type StateSpec, type SystemSpec } from '../language/ast';
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import type { Complex, CompiledFunction, Dimension, Expr, Scope, UnitSystem } from '../expr/types';
import { DEFAULT_PARSE_OPTIONS, parseExpression } from '../expr/sandbox';
import { forEachNode } from '../expr/walk';
import { checkExpression } from '../expr/check';
import { evaluateConstant, compileFunction } from '../expr/compile';
import { makeUnitSystem, createScope, sameDimension } from '../expr/units';
import { dimensionOf, type ValueKind } from './dimensions';
import { capital, fmt } from './findings';
import { raiseHint, type CapName } from '../shared/limits';
import { mixtureModel, thermalModel, type MixedHooks, type MixtureModel, type ThermalModel } from './mixedModel';

/** A system with its parameters evaluated (internal units). */
export type SystemModel =
  | { kind: 'box'; a: number; b: number; span: Span }
  | { kind: 'well'; depth: number; width: number; center: number; span: Span }
  | { kind: 'oscillator'; omega: number; center: number; span: Span }
  | {
      kind: 'potential';
      V: CompiledFunction;
      a: number;
      b: number;
      span: Span;
      exprSpan: Span;
      /**
       * Identifies V: its text, the unit system and the values of the names it uses. Equal keys give
       * equal potentials, so a solved basis can be reused (systems.ts keeps a small memo).
       */
      key?: string;
    };

/** A state with its parameters evaluated or compiled. */
export type StateModel =
  | { kind: 'psi'; fn: CompiledFunction; expr: ExprText; usesPhi: boolean }
  | { kind: 'eigen'; level: number; levelSpan: Span; system: SystemModel }
  | { kind: 'gaussian'; center: number; width: number; momentum: number }
  | ThermalModel
  | MixtureModel;

/** A checked `expect` line. */
export type ExpectModel =
  | { kind: 'norm' | 'energy' | 'spread'; stmt: Statement; comparison: ComparisonModel }
  | { kind: 'parity'; stmt: Statement; value: 'even' | 'odd' | 'mixed' }
  | { kind: 'weight'; stmt: Statement; from: number; to: number; comparison: ComparisonModel };

/** A comparison with its numbers in internal units. */
export interface ComparisonModel {
  kind: 'tolerance' | 'atLeast' | 'atMost';
  value: number;
  tolerance: number;
  /** The written value, to be replaced by a quick fix. */
  valueText: ExprText;
}

/** Everything the numerical stage needs. */
export interface Model {
  units: UnitSystem;
  mass: number;
  system: { model: SystemModel; stmt: Statement } | null;
  state: { model: StateModel; stmt: Statement } | null;
  basis: { value: number; stmt: Statement | null };
  expects: ExpectModel[];
  evolve: { to: number; steps: number; stmt: Statement } | null;
  /** Names defined by `let`, with their values (internal units) and where they are defined. */
  lets: Map<string, { value: Complex; dimension: Dimension; span: Span; valueSpan: Span }>;
  /** True when no error-severity diagnostic was found. */
  ok: boolean;
}

/** Options of `buildModel`. */
export interface ModelOptions {
  defaultBasis: number;
  maxBasis: number;
  maxEvolveSteps: number;
  /** Longest expression and deepest bracket nesting the sandbox parses (its own defaults when absent). */
  maxExpressionLength?: number;
  maxNesting?: number;
}


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
      const m = this.state(stateStmt.state, this.model.system !== null);
      if (m) this.model.state = { model: m, stmt: stateStmt };
    }
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
        const v = this.constant(stmt.expr, 'mass', 'the mass');
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
        const n = this.integer(stmt.expr, 'the basis size', 1, this.options.maxBasis);
        if (n !== null) m.basis = { value: n, stmt };
        return;
      }
      case 'expect': {
        const x = this.expect(stmt);
        if (x) m.expects.push(x);
        return;
      }
      case 'evolve': {
        const t = this.constant(stmt.to, 'time', 'the evolution time');
        let steps = 200;
        if (stmt.steps) {
          const k = this.integer(stmt.steps, 'the number of steps', 1, this.options.maxEvolveSteps, 'maxEvolveSteps');
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
    if (!e) return;
    // evaluateConstant checks names and dimensions itself (no dimension is expected of a `let`).
    const v = evaluateConstant(e, this.scope);
    this.push(v.diagnostics);
    if (!v.result) return;
    this.scope.values.set(stmt.name, { value: v.result.value, dimension: v.result.dimension, definedAt: stmt.nameSpan });
    this.lets.set(stmt.name, { value: v.result.value, dimension: v.result.dimension, span: stmt.nameSpan, valueSpan: stmt.expr });
  }

  private expr(src: ExprText): Expr | null {
    const p = parseExpression(src, { maxLength: this.options.maxExpressionLength ?? DEFAULT_PARSE_OPTIONS.maxLength, maxDepth: this.options.maxNesting ?? DEFAULT_PARSE_OPTIONS.maxDepth });
    this.push(p.diagnostics);
    return p.result;
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
    if (this.units.mode === 'physical' && !sameDimension(v.result.dimension, expected)) {
      const worded = checkExpression(e, this.scope, expected, what).diagnostics;
      this.push(worded);
      if (worded.some((d) => d.severity === 'error')) return null;
    }
    const { re, im } = v.result.value;
    if (Math.abs(im) > 1e-12 * Math.max(1, Math.abs(re))) {
      this.error('evaluation', src, `${capital(what)} must be real, but it is complex (${fmt(re)} + ${fmt(im)} i).`);
      return null;
    }
    return kind === 'frequency' ? re * 2 * Math.PI : re;
  }

  private integer(src: ExprText, what: string, min: number, max: number, cap: CapName = 'maxBasis'): number | null {
    const v = this.constant(src, 'dimensionless', what);
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
    const a = this.constant(aArg.value, 'length', "the box's left end");
    const b = this.constant(bArg.value, 'length', "the box's right end");
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
    const depth = this.constant(d.value, 'energy', "the well's depth");
    const width = this.constant(w.value, 'length', "the well's width");
    const c = named.get('center');
    const center = c ? this.constant(c.value, 'length', "the well's centre") : 0;
    if (depth === null || width === null || center === null) return null;
    if (!(depth > 0)) {
      this.error('evaluation', d.value, `The well's depth must be positive (it is the potential outside the well), not ${fmt(depth)}.`);
      return null;
    }
    if (!(width > 0)) {
      this.error('evaluation', w.value, `The well's width must be positive, not ${fmt(width)}.`);
      return null;
    }
    return { kind: 'well', depth, width, center, span: spec.span };
  }

  private oscillator(spec: Extract<SystemSpec, { kind: 'oscillator' }>): SystemModel | null {
    const named = this.args(spec.args);
    let omega: number | null = null;
    const o = named.get('omega');
    const f = named.get('frequency');
    const q = named.get('quantum');
    const given = o ?? f ?? q;
    if (!given) return null;
    if (o) omega = this.constant(o.value, 'angularFrequency', 'the angular frequency');
    else if (f) omega = this.constant(f.value, 'frequency', 'the frequency');
    else if (q) omega = this.constant(q.value, 'energy', 'the oscillator quantum'); // hbar = 1 internally
    const c = named.get('center');
    const center = c ? this.constant(c.value, 'length', "the oscillator's centre") : 0;
    if (omega === null || center === null) return null;
    if (!(omega > 0)) {
      this.error('evaluation', given.value, `The oscillator's frequency must be positive, not ${fmt(omega)}.`);
      return null;
    }
    return { kind: 'oscillator', omega, center, span: spec.span };
  }

  private potential(spec: Extract<SystemSpec, { kind: 'potential' }>): SystemModel | null {
    const a = this.constant(spec.from, 'length', "the interval's left end");
    const b = this.constant(spec.to, 'length', "the interval's right end");
    const e = this.expr(spec.expr);
    if (!e) return null;
    const scope: Scope = { ...this.scope, hasX: true, hasPhi: false };
    const checked = checkExpression(e, scope, dimensionOf('energy', this.units), 'the potential');
    this.push(checked.diagnostics);
    if (checked.dimension === null || a === null || b === null) return null;
    if (!(b > a)) {
      this.error('evaluation', spec.span, `The interval's right end (${fmt(b)}) must lie to the right of its left end (${fmt(a)}).`);
      return null;
    }
    const c = compileFunction(e, scope);
    this.push(c.diagnostics);
    if (!c.result) return null;
    return { kind: 'potential', V: c.result, a, b, span: spec.span, exprSpan: spec.expr, key: potentialKey(spec.expr.text, e, scope) };
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
        const c = compileFunction(e, scope);
        this.push(c.diagnostics);
        if (!c.result) return null;
        return { kind: 'psi', fn: c.result, expr: spec.expr, usesPhi: usesName(e, 'phi') };
      }
      case 'eigen': {
        const level = this.integer(spec.level, 'the level', 0, this.options.maxBasis);
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
        const center = this.constant(c.value, 'length', "the packet's centre");
        const width = this.constant(w.value, 'length', "the packet's width");
        const momentum = k ? this.constant(k.value, 'wavenumber', "the packet's momentum") : 0;
        if (center === null || width === null || momentum === null) return null;
        if (!(width > 0)) {
          this.error('evaluation', w.value, `The packet's width must be positive, not ${fmt(width)}.`);
          return null;
        }
        return { kind: 'gaussian', center, width, momentum };
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

  private comparison(c: import('../language/ast').Comparison, kind: ValueKind, what: string): ComparisonModel | null {
    const value = this.constant(c.value, kind, what);
    if (value === null) return null;
    if (c.kind === 'tolerance') {
      const tol = this.constant(c.tolerance, kind, 'the tolerance');
      if (tol === null) return null;
      if (!(tol >= 0)) {
        this.error('evaluation', c.tolerance, 'The tolerance must not be negative.');
        return null;
      }
      return { kind: 'tolerance', value, tolerance: tol, valueText: c.value };
    }
    return { kind: c.kind, value, tolerance: 0, valueText: c.value };
  }

  private expect(stmt: Statement): ExpectModel | null {
    if (stmt.kind !== 'expect') return null;
    const x = stmt.expectation;
    switch (x.kind) {
      case 'parity':
        return { kind: 'parity', stmt, value: x.value };
      case 'norm': {
        const c = this.comparison(x.comparison, 'dimensionless', 'the expected norm');
        return c ? { kind: 'norm', stmt, comparison: c } : null;
      }
      case 'energy':
      case 'spread': {
        const c = this.comparison(x.comparison, 'energy', x.kind === 'energy' ? 'the expected energy' : 'the expected spread');
        return c ? { kind: x.kind, stmt, comparison: c } : null;
      }
      case 'weight': {
        const from = this.integer(x.from, 'the first level', 0, this.options.maxBasis);
        const to = x.to ? this.integer(x.to, 'the last level', 0, this.options.maxBasis) : from;
        const c = this.comparison(x.comparison, 'dimensionless', 'the expected weight');
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
