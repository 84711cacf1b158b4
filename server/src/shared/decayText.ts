/**
 * The one wording of the fitted tail of the expansion coefficients (`decay` of a result), shared by the
 * panel's summary and the command line's table. Pure; no dependencies but the number formatter, so the
 * browser bundle can import it too.
 *
 * What the laws mean, for sine-like levels between hard walls (the box, a potential on an interval):
 * integrating c_n = integral of psi(x) phi_n(x) dx by parts k + 1 times leaves boundary terms in
 * psi^(k) at an interior jump of psi^(k), and in the even derivatives psi, psi'', psi'''' ... at a wall
 * (the odd ones drop out because every sin(n pi x / L) vanishes there), so |c_n| ~ n^-(k+1) when
 * psi^(k) is the lowest derivative that jumps, or (k even) does not vanish at a wall; coefficients that
 * fall faster than any power mean psi is smooth to every order (Boyd, Chebyshev and Fourier Spectral
 * Methods, ch. 2 (from memory)). On the line (the oscillator) a power law has no such derivative count.
 */
import { formatNumber } from './numbers';

/** The decay facts of a result that the wording reads (`AnalysisResult['decay']`). */
export interface DecayFacts {
  exponent: number | null;
  classification: 'jump' | 'kink' | 'algebraic' | 'smooth' | 'unknown';
  rate?: number | null;
  range?: [number, number] | null;
}

/** What the wording needs to know besides the fit. */
export interface DecayTextOptions {
  /** A mixed state: the weights are populations P_n and the fit is of sqrt(P_n). */
  mixture: boolean;
  /** The system's kind: 'box' and 'potential' have hard walls, the oscillator has none. */
  kind: string | null | undefined;
  /** Plain ASCII (the command line) instead of Unicode (the panel). */
  ascii?: boolean;
  /**
   * The result's parity ('even' or 'odd': the state has one symmetry, so only every second level holds
   * weight and a geometric fall is worded per populated step of 2 in n).
   */
  parity?: string | null;
}

/** An exponent off a whole number by more than this is not read as a jump in one derivative. */
const WHOLE = 0.2;

const SUPERSCRIPT = '⁰¹²³⁴⁵⁶⁷⁸⁹';

/** The k-th derivative of psi: psi, psi', psi'', psi''', then d^k psi/dx^k. */
function derivative(k: number, ascii: boolean): string {
  const psi = ascii ? 'psi' : 'ψ';
  if (k <= 3) return psi + (ascii ? "'".repeat(k) : ['', '′', '″', '‴'][k]);
  if (ascii) return `d^${k} psi/dx^${k}`;
  const sup = String(k).replace(/\d/g, (d) => SUPERSCRIPT[Number(d)]!);
  return `d${sup}${psi}/dx${sup}`;
}

/** What a power law n^-p of |c_n| says about psi. */
function powerMeaning(p: number, walls: boolean, ascii: boolean): string {
  const psi = ascii ? 'psi' : 'ψ';
  const whole = Math.round(p);
  if (!walls) return `${psi} is not smooth somewhere, or falls off slowly at large |x|`;
  if (whole < 1 || Math.abs(p - whole) > WHOLE) return `${psi} or one of its derivatives is singular somewhere (a power that is not a whole number)`;
  const k = whole - 1;
  const d = derivative(k, ascii);
  if (k === 1) return `${d} jumps (${psi} has a kink)`;
  return k % 2 === 0 ? `${d} jumps, or is nonzero at a wall` : `${d} jumps`;
}

/**
 * The decay line's text, e.g. `|c_n| ~ n^-2 over n = 75..150: ψ′ jumps (ψ has a kink)` or `P_n falls geometrically, by
 * about a factor 0.114 a level over n = 20..39: faster than any power of n`; null when nothing is
 * known (no fit, or too few levels). For a mixed state the law is said of the populations P_n
 * themselves: P_n = (sqrt(P_n))^2, so P_n ~ n^-2p and a geometric fall e^{-r n} of sqrt(P_n) is a factor
 * e^{-2r} of P_n a level (derived in this comment).
 */
export function decayText(decay: DecayFacts | null | undefined, options: DecayTextOptions): string | null {
  if (!decay || decay.classification === 'unknown') return null;
  const ascii = options.ascii === true;
  const what = options.mixture ? 'P_n' : '|c_n|';
  const range = decay.range ?? null;
  // The panel keeps "n = a..b" on one line (no-break spaces); the command line prints plain spaces.
  const sp = ascii ? ' ' : '\u00a0';
  const over = range ? ` over n${sp}=${sp}${range[0]}..${range[1]}` : '';
  const walls = options.kind === 'box' || options.kind === 'potential';
  if (decay.exponent !== null) {
    const p = decay.exponent;
    const law = `${what} ~ n^-${formatNumber(options.mixture ? 2 * p : p, 3)}${over}`;
    const meaning = powerMeaning(p, walls, ascii);
    return options.mixture ? `${law}: in a state of the mixture, ${meaning}` : `${law}: ${meaning}`;
  }
  const rate = decay.rate ?? null;
  if (rate === null || !(rate > 0)) {
    const last = range ? ` after n${sp}=${sp}${range[1]}` : '';
    return `${what} stops${last}: a finite sum of levels`;
  }
  const ratio = Math.exp(-(options.mixture ? 2 : 1) * rate);
  const smooth = options.mixture ? '' : `, so ${ascii ? 'psi' : 'ψ'} is smooth`;
  // A state of one parity holds weight on every second level: the factor from one of them to the next.
  const alternate = options.parity === 'even' || options.parity === 'odd';
  const step = alternate ? `${formatNumber(ratio * ratio, 3)} from one weighted level to the next (every second n)` : `${formatNumber(ratio, 3)} a level`;
  return `${what} falls geometrically, by about a factor ${step}${over}: faster than any power of n${smooth}`;
}
