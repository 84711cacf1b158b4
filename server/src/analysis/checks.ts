/**
 * The findings about a system and a state, one small check per family (limits of the expansion, norm,
 * walls, a spike, convergence, parity, capture): each `(measurements, context) => diagnostics`, pure
 * wording of numbers measure.ts computed. Nothing here computes physics.
 */
import type { EngineDiagnostic, FixData } from '../language/catalogue';
import type { Span, Statement } from '../language/ast';
import type { Eigenbasis } from '../physics/types';
import type { Model } from './model';
import type { Limits } from './options';
import { MissingLevel, type BuiltBasis } from './systems';
import { BadValue } from './expand';
import { TOL, type StateMeasurements, type Stop } from './measure';
import { captureText, fmt, formatFactor, growthText, notSquareIntegrable, pct, plural, replaceFix, warn } from './findings';
import { raiseHint } from '../shared/limits';
import { formatNumber } from '../shared/numbers';
import { nearlySymmetric } from '../physics/parity';
import { unresolvedFinding } from './unresolvedLevels';

/** What the checks need besides the measurements. */
export interface CheckContext {
  model: Model;
  basis: Eigenbasis;
  /** Where findings about the state go: its formula, or the state line. */
  stateSpan: Span;
  /** The system's statement (a `basis` line is inserted after it). */
  systemStmt: Statement;
  limits: Limits;
  /** A sampled state whose samples resolve fewer levels than asked: how many they resolve (samplesState.ts). */
  resolved?: number;
}

/** One family of findings about a measured state. */
export type StateCheck = (m: StateMeasurements, ctx: CheckContext) => EngineDiagnostic[];

/** The finding that says why a state could not be measured. */
export function stopFinding(s: Stop, ctx: CheckContext): EngineDiagnostic {
  const span = ctx.stateSpan;
  const basis = ctx.basis;
  switch (s.stop) {
    case 'noFalloff':
      return warn('norm', span, 'The state does not fall off away from the system: |psi|^2 cannot be integrated over the line.', undefined, 'error');
    case 'missingLevel':
      return warn('evaluation', span, `'phi(${s.level}, x)' is not a level of this system: levels run from ${basis.firstLabel} to ${basis.firstLabel + basis.count - 1}${basis.kind === 'well' ? '' : ' (raise `basis`)'}.`);
    case 'noTime':
      return warn('limits', span, `The time limit of ${ctx.limits.maxMillis} ms ran out before the state was projected on a first grid; lower \`basis\` or raise the limit.${raiseHint('time')}`);
    case 'notSquareIntegrable':
      return warn('norm', span, notSquareIntegrable(s.singular), undefined, 'error');
    case 'overflow':
      return warn('evaluation', span, 'The integral of |psi|^2 overflows (the state is too large to square in double precision); scale the state down.', undefined, 'error');
    case 'underflow':
      return warn('norm', span, 'The state is so small that |psi|^2 underflows to zero in double precision; multiply it by a large factor.', undefined, 'error');
    case 'tooNarrow':
      return warn('norm', span, `The state is far narrower than the system's extent (${fmt(s.window[0])} to ${fmt(s.window[1])}), so the grid misses it; check the mass and the system's size.`, undefined, 'error');
    case 'zero':
      // Sampling cannot prove a state zero between its points: say what was seen, not more.
      return warn('norm', span, `The state is zero at every point sampled${s.points ? ` (${s.points} points over the system)` : ''}, so there is nothing to expand; a feature narrower than their spacing would be missed.`, undefined, 'error');
    case 'narrowPeak':
      return warn('norm', span, `The state is a peak at x = ${fmt(s.center)} of width ${fmt(s.width)}, narrower than double precision can place grid points on there; widen it or move the system's origin closer to it.`, undefined, 'error');
    case 'notFinite':
      // Overflowing or underflowing parameters (a mass of 1e-300) make coefficients NaN or energies infinite.
      return warn('evaluation', span, "The coefficients or level energies are not finite numbers: the system's, the mass's or the state's values are beyond what double precision can compute; rescale them.", undefined, 'error');
  }
}

/** Facts of the basis itself: a well's bound-state count, levels the solver left unresolved, wall-only levels. */
export function checkBasisFacts(built: BuiltBasis, asked: number, ctx: CheckContext): EngineDiagnostic[] {
  const out: EngineDiagnostic[] = [];
  const basis = built.basis;
  const sysSpan = ctx.systemStmt.span;
  const basisStmt = ctx.model.basis.stmt;
  if (basis.kind === 'well' && basisStmt && asked > basis.count) {
    out.push(warn('basis', basisStmt.span, `The well holds ${plural(basis.count, 'bound state')}; basis ${asked} is capped at ${basis.count}.`, undefined, 'info'));
  }
  // Unresolved levels after a cancellation need no finding: a cancelled analysis is not shown.
  const unresolved = unresolvedFinding(built, asked, ctx);
  if (unresolved) out.push(unresolved);
  if (built.wallLevels && built.wallLevels.length > 0) {
    const first = built.wallLevels[0]! + basis.firstLabel;
    const [hardLeft, hardRight] = built.hardWalls ?? [false, false];
    const where = hardLeft ? 'at the open right wall' : hardRight ? 'at the open left wall' : 'at both walls';
    // Worded for what V does at the open walls: still rising (a quartic cut off), or levelling off or falling.
    const t = built.wallTrend;
    const rising = t !== undefined && (hardLeft || t.left === 'rises') && (hardRight || t.right === 'rises');
    const what = rising
      ? 'the potential is still rising there, so the walls, not the potential, set these levels; widen the interval to resolve them'
      : "they are the walls' box-quantised continuum, not bound states of the potential";
    out.push(warn('continuum', sysSpan, `Levels from n = ${first} lie above the potential ${where}: ${what}.`, undefined, 'info'));
  }
  return out;
}

/** Limits the expansion ran into: the time limit or the grid cap stopped the refinement. */
export const checkExpansion: StateCheck = (m, ctx) => {
  if (m.stopped === 'time') return [warn('limits', ctx.stateSpan, `The time limit of ${ctx.limits.maxMillis} ms stopped the grid refinement; the coefficients may be inaccurate.${raiseHint('time')}`)];
  if (m.stopped === 'cap') return [warn('limits', ctx.stateSpan, `The grid cap of ${ctx.limits.maxGridPoints} points stopped refinement; the coefficients may be inaccurate.${raiseHint('maxGridPoints')}`)];
  return [];
};

/** A formula whose integral of |psi|^2 is not 1, with the fix that normalises it. */
export const checkNorm: StateCheck = (m, ctx) => {
  const state = ctx.model.state?.model;
  if (state?.kind !== 'psi' || !(Math.abs(m.norm - 1) > TOL)) return [];
  const factorText = formatFactor(1 / Math.sqrt(m.norm));
  const expr = state.expr;
  return [
    warn('norm', ctx.stateSpan, `The integral of |psi|^2 is ${fmt(m.norm)}, not 1; results are for the normalised state. Multiply psi by ${factorText} to normalise it.`, [
      replaceFix('Normalise the state', expr, `${factorText} * (${expr.text})`),
    ]),
  ];
};

/** The walls' boundary condition: the state's values at the walls and its weight outside them. */
export const checkWalls: StateCheck = (m, ctx) => {
  const w = m.walls;
  if (!w || !w.broken) return [];
  const [a, b] = w.walls;
  const [va, vb] = w.values;
  // Positions in the file's length unit, as written.
  const lu = ctx.model.units.mode === 'physical' ? ` ${ctx.model.units.length.name}` : '';
  const at = (x: number, v: number): string =>
    !Number.isFinite(v)
      ? `psi is infinite at ${fmt(x)}${lu}`
      : `psi(${fmt(x)}${lu}) = ${fmt(v / w.rootNorm)} normalised${w.peak > 0 ? `, ${fmt(v / w.peak)} times its largest value` : ''}`;
  const offA = va > w.tolerance;
  const offB = vb > w.tolerance;
  const problems: string[] = [];
  if (offA && offB) problems.push(`it is not zero at the walls (${at(a, va)}; ${at(b, vb)})`);
  else if (offA) problems.push(`it is not zero at the left wall (${at(a, va)})`);
  else if (offB) problems.push(`it is not zero at the right wall (${at(b, vb)})`);
  if (w.outside > 1e-9) problems.push(`${pct(w.outside)} of |psi|^2 lies outside the walls at ${fmt(a)} and ${fmt(b)}${lu} and is dropped`);
  let message = `The state breaks the walls' boundary condition: ${problems.join('; ')}.`;
  let fixes: FixData[] | undefined;
  const spec = ctx.systemStmt.kind === 'system' && ctx.systemStmt.system.kind === 'potential' ? ctx.systemStmt.system : null;
  // Only an open wall may move: it truncates the line, while a hard wall is the physics.
  const widenLeft = spec !== null && !w.hard[0] && (offA || (w.outside > 1e-9 && !offB));
  const widenRight = spec !== null && !w.hard[1] && (offB || (w.outside > 1e-9 && !offA));
  if (spec && (widenLeft || widenRight)) {
    const half = fmt((b - a) / 2);
    const from = widenLeft ? `(${spec.from.text}) - ${half}` : spec.from.text;
    const to = widenRight ? `(${spec.to.text}) + ${half}` : spec.to.text;
    message += ` The ${widenLeft && widenRight ? 'open walls cut' : 'open wall cuts'} the state: widen the interval${widenLeft && widenRight ? '' : widenLeft ? ' to the left' : ' to the right'}.`;
    fixes = [replaceFix('Widen the interval', { start: spec.from.start, end: spec.to.end }, `${from}, ${to}`)];
  }
  if ((offA && w.hard[0]) || (offB && w.hard[1])) message += ` ${hardWallText(m)}`;
  return [warn('boundary', ctx.stateSpan, message, fixes)];
};

/** A nonzero value at a hard wall: the decay it forces (as measured), and what the line through the wall values accounts for. */
function hardWallText(m: StateMeasurements): string {
  const d = m.decay;
  const measured =
    d?.exponent != null
      ? ` (over the levels computed |c_n| falls off as n^-${fmt(d.exponent)})`
      : d?.classification === 'smooth'
        ? ' (over the levels computed they still fall off faster than any power: the 1/n tail lies beyond them)'
        : '';
  let text = `Its coefficients fall off only as 1/n for large n${measured} and its energy mean is infinite.`;
  const line = m.walls?.line;
  if (line && Number.isFinite(line.weight)) {
    text += ` The straight line through its two wall values carries ${fmt(line.weight)} of |psi|^2`;
    text += line.mean !== null ? `; the state minus that line (zero at both walls) has energy mean ${fmt(line.mean)}${line.spread !== null ? ` and spread ${fmt(line.spread)}` : ''}.` : '.';
  }
  return text;
}

/** An integrable spike: the infinite energy it brings, and the share of |psi|^2 too close to it for double precision. */
export const checkSpike: StateCheck = (m, ctx) => {
  const g = m.singular;
  if (!g) return [];
  const out = [
    warn('convergence', ctx.stateSpan, `The state is infinite at x = ${fmt(g.x)}, growing like ${growthText(g)}: |psi|^2 is integrable there but |psi'|^2 is not, so the energy mean is infinite and the coefficients converge slowly.`),
  ];
  if (m.unresolvedNearSpike > 1e-9) {
    out.push(
      warn('limits', ctx.stateSpan, `Double precision cannot sample closer to x = ${fmt(g.x)} than about ${fmt(m.closest)}, and about ${fmt(m.unresolvedNearSpike)} of |psi|^2 lies that close; the norm and coefficients are accurate to about that.`, undefined, 'warning'),
    );
  }
  return out;
};

/** Slow convergence: a jump, a kink, a slow decay, or high levels that carry energy the basis leaves out. */
export const checkConvergence: StateCheck = (m, ctx) => {
  const span = ctx.stateSpan;
  const decay = m.decay;
  // The fitted exponent to the three digits a fit over a few dozen levels resolves; positions in the file's length unit.
  const p = decay?.exponent != null ? ` |c_n| falls off as n^-${formatNumber(decay.exponent, 3)}.` : '';
  const u = ctx.model.units.mode === 'physical' ? ` ${ctx.model.units.length.name}` : '';
  if (m.jumps.length > 0) return [warn('convergence', span, `The state jumps at x = ${fmt(m.jumps[0]!)}${u}: the expansion converges slowly (Gibbs ringing) and the energy mean is infinite.${p}`)];
  if (m.kinks.length > 0) return [warn('convergence', span, `The state has a kink at x = ${fmt(m.kinks[0]!)}${u}: the energy mean is finite but the energy spread is infinite.${p}`, undefined, 'info')];
  // A nonzero value at a hard wall is the jump this decay shows: the boundary finding words it, with the measured law.
  const atHardWall = m.walls !== null && m.walls.values.some((v, i) => v > m.walls!.tolerance && m.walls!.hard[i]);
  if (decay && (decay.classification === 'kink' || (decay.classification === 'jump' && !atHardWall))) {
    return [warn('convergence', span, `The coefficients decay slowly, as for a ${decay.classification}, so ${decay.classification === 'jump' ? 'the energy mean is infinite' : 'the energy spread is infinite'}.${p}`)];
  }
  const basis = m.basis;
  if (m.mean === null || basis.kind === 'well' || !(m.captured > 1 - 1e-3)) return [];
  const scale = Math.max(Math.abs(m.mean), Math.abs(basis.energies[0]!), 1e-300);
  const fromLevels = m.meanFromLevels / m.captured;
  const rel = Math.abs(fromLevels - m.mean) / scale;
  if (!(rel > 1e-3)) return [];
  return [warn('convergence', span, `The energy mean from the levels computed (${fmt(fromLevels)}) differs from <psi|H|psi> (${fmt(m.mean)}) by ${pct(rel)}: the high levels carry energy the basis leaves out; raise \`basis\`.`)];
};

/** Symmetry: the levels that vanish for an even or odd state, or a state almost of one parity. */
export const checkParity: StateCheck = (m, ctx) => {
  const p = m.parity;
  if (!p) return [];
  const c = fmt(p.center);
  // Levels of the other parity: index 1, 3, ... vanish for an even state, 0, 2, ... for an odd one; only
  // those the basis holds are named (a well with one bound level has none of the other parity).
  const vanish = (parity: 'even' | 'odd'): string => {
    const first = m.basis.firstLabel + (parity === 'even' ? 1 : 0);
    const last = m.basis.firstLabel + m.basis.count - 1;
    if (first > last) return `the levels of the other parity (n = ${first}, ${first + 2}, ...) would vanish by symmetry; the basis's ${plural(m.basis.count, 'level')} ${m.basis.count === 1 ? 'is' : 'are'} all of the state's parity`;
    const named = [first, first + 2, first + 4].filter((n) => n <= last);
    return `the levels n = ${named.join(', ')}${first + 6 <= last ? ', ...' : ''} vanish by symmetry`;
  };
  if (p.parity !== 'mixed') return [warn('parity', ctx.stateSpan, `The state is ${p.parity} about x = ${c}: ${vanish(p.parity)}.`, undefined, 'info')];
  const near = nearlySymmetric(p);
  if (!near) return [];
  return [warn('parity', ctx.stateSpan, `The state is almost ${near.almost} about x = ${c} but not quite: the ${near.almost === 'even' ? 'odd' : 'even'} part carries ${pct(near.fraction)} of the weight.`, undefined, 'warning')];
};

/** Capture: weight in a finite well's continuum, or a basis too small for the state (with the basis that suffices). */
export const checkCapture: StateCheck = (m, ctx) => {
  if (m.continuum !== null) {
    if (!(m.continuum > TOL)) return [];
    return [
      warn('continuum', ctx.stateSpan, `${pct(m.continuum)} of the state lies outside the ${plural(m.basis.count, 'bound state')} (in the continuum of unbound states); the bound levels capture ${pct(m.captured)}.`),
    ];
  }
  if (!(m.captured < 1 - TOL)) return [];
  // Past the samples' resolution no basis helps: the resolution finding says so, and no fix is offered.
  const need = ctx.resolved !== undefined && m.needed !== null && m.needed > ctx.resolved ? null : m.needed;
  const past = need === null && m.needed !== null;
  const basisStmt = ctx.model.basis.stmt;
  const fixes: FixData[] | undefined =
    need !== null && need <= ctx.limits.maxBasis
      ? [basisStmt && basisStmt.kind === 'basis'
          ? replaceFix(`Raise basis to ${need}`, basisStmt.expr, String(need))
          : { kind: 'insert', title: `Add basis ${need}`, at: ctx.systemStmt.span.end, text: `\nbasis ${need}` }]
      : undefined;
  const count = m.levels.length;
  const tail = need !== null ? ` ${need} levels capture all but 1e-6.` : past ? ` ${m.needed} levels would, but the samples resolve only ${ctx.resolved}.` : ' Even the largest basis allowed does not capture all but 1e-6.';
  return [warn('basis', basisStmt ? basisStmt.span : ctx.stateSpan, `The ${count} levels capture ${captureText(m.captured)} of the state, short of 1 by ${fmt(1 - m.captured)}.${tail}`, fixes)];
};

/** The state checks, in the order their findings are listed. */
export const STATE_CHECKS: readonly StateCheck[] = [checkExpansion, checkNorm, checkWalls, checkSpike, checkConvergence, checkParity, checkCapture];

/**
 * The finding for a state that could not be evaluated (thrown by the measurement as `BadValue` or
 * `MissingLevel`), on the state's formula; null for any other error.
 */
export function evaluationFinding(err: unknown, model: Model | null): EngineDiagnostic | null {
  const st = model?.state?.stmt;
  const span = st && st.kind === 'state' && st.state.kind === 'psi' ? st.state.expr : st?.span ?? { start: 0, end: 0 };
  if (err instanceof MissingLevel) {
    // Systems without walls evaluate the state while looking for its window, before the expansion.
    return warn('evaluation', span, `'phi(${err.level}, x)' is not among the levels of the basis; raise \`basis\` until it includes level ${err.level}.`);
  }
  if (!(err instanceof BadValue)) return null;
  if (err.growth && !err.growth.integrable) return warn('norm', span, notSquareIntegrable(err.growth), undefined, 'error');
  if (err.growth) {
    return warn('evaluation', span, `The state is infinite at x = ${fmt(err.x)}, growing like ${growthText(err.growth)} there: |psi|^2 is integrable, but the energy is infinite and the grid cannot sample that point. Remove the singularity or move it off x = ${fmt(err.x)}.`);
  }
  const what = Number.isNaN(err.value) ? 'not a number (as from 0/0 or Infinity - Infinity)' : `${err.value > 0 ? '+' : '-'}Infinity`;
  const where = Number.isFinite(err.x) ? `x = ${fmt(err.x)}` : 'a point the grid cannot represent (a position overflows double precision)';
  return warn('evaluation', span, `The state is ${what} at ${where}; it must be finite everywhere.`);
}
