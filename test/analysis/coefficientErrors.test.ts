/**
 * Coefficients of numerical systems carry an uncertainty from the solver's last two grids, and the true
 * error lies within it: checked on the step box against its eigenfunctions in closed form.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';
import { manualClock } from '../../server/src/physics/budget';

/** A clock that never advances: the time limit is never reached, so a loaded machine cannot cut these analyses short. */
const timeless = { clock: manualClock() };

/**
 * The step box V = 0 on [0, 1/2), V0 on [1/2, 1], hard walls at 0 and 1 (m = hbar = 1). Derived in this
 * comment: phi = A sin(k x) on the left and B s(1 - x) on the right, with k = sqrt(2E) and s(u) = sin(q u),
 * q = sqrt(2(E - V0)) above the step or sinh(r u), r = sqrt(2(V0 - E)) below it. Continuity of phi and
 * phi' at 1/2 gives k cot(k/2) = -q cot(q/2) (resp. -r coth(r/2)); its roots are found by bisection on the
 * product form f(E) = k cos(k/2) s(1/2) + sin(k/2) s'(1/2), which has no poles.
 */
function stepBox(V0: number, levels: number): { E: number; phi: (x: number) => number }[] {
  const parts = (E: number) => {
    const k = Math.sqrt(2 * E);
    const above = E > V0;
    const q = Math.sqrt(2 * Math.abs(E - V0));
    const s = (u: number): number => (above ? Math.sin(q * u) : q === 0 ? u : Math.sinh(q * u));
    const ds = (u: number): number => (above ? q * Math.cos(q * u) : q === 0 ? 1 : q * Math.cosh(q * u));
    return { k, s, ds };
  };
  const f = (E: number): number => {
    const { k, s, ds } = parts(E);
    return k * Math.cos(k / 2) * s(0.5) + Math.sin(k / 2) * ds(0.5);
  };
  const out: { E: number; phi: (x: number) => number }[] = [];
  let lo = 1e-9;
  const dE = 0.05;
  while (out.length < levels) {
    const hi = lo + dE;
    if (f(lo) * f(hi) <= 0) {
      let a = lo;
      let b = hi;
      for (let i = 0; i < 200 && b - a > 1e-15 * b; i++) {
        const m = (a + b) / 2;
        if (f(a) * f(m) <= 0) b = m;
        else a = m;
      }
      const E = (a + b) / 2;
      const { k, s } = parts(E);
      const B = Math.sin(k / 2) / s(0.5);
      const raw = (x: number): number => (x < 0.5 ? Math.sin(k * x) : B * s(1 - x));
      const q = compositeGaussLegendre(0, 1, { breakpoints: [0.5], panels: 200, order: 20 });
      let n = 0;
      for (let j = 0; j < q.x.length; j++) n += q.w[j]! * raw(q.x[j]!) ** 2;
      // The solver's sign convention: positive just inside the left wall.
      const c = 1 / Math.sqrt(n);
      out.push({ E, phi: (x) => c * raw(x) });
    }
    lo = hi;
  }
  return out;
}

describe('coefficient uncertainties of numerical systems', () => {
  // Measured: true coefficient errors 1e-11 to 9e-10, stated 6e-11 to 4e-9 (about 4.7 times the error).
  it('the step box: every |c_n - c_n(exact)| and |E_n - E_n(exact)| lies within its stated uncertainty', () => {
    const K = 10;
    const exact = stepBox(20, K);
    // The root of the matching condition above, to six digits (from an independent shooting check): E_1 = 10.839106.
    expect(exact[0]!.E).toBeCloseTo(10.839106, 5);
    const psi = (x: number): number => Math.sin(Math.PI * x) ** 2 / Math.sqrt(3 / 8);
    const q = compositeGaussLegendre(0, 1, { breakpoints: [0.5], panels: 200, order: 20 });
    const r = analyse(`system V(x) = x < 0.5 ? 0 : 20 over [0, 1]\nstate psi(x) = sin(pi x)^2\nbasis ${K}\n`, timeless);
    for (let n = 0; n < K; n++) {
      let c = 0;
      for (let j = 0; j < q.x.length; j++) c += q.w[j]! * psi(q.x[j]!) * exact[n]!.phi(q.x[j]!);
      const lv = r.levels[n]!;
      expect(lv.coefficientUncertainty).toBeDefined();
      expect(Math.abs(lv.re! - c)).toBeLessThanOrEqual(lv.coefficientUncertainty!);
      expect(lv.coefficientUncertainty!).toBeLessThan(1e-6);
      expect(Math.abs(lv.energy - exact[n]!.E)).toBeLessThanOrEqual(lv.uncertainty!);
    }
  });

  it('closed-form systems carry none (their coefficients are exact projections)', () => {
    const r = analyse('system box(0, 1)\nstate psi(x) = sin(pi x)^2\n');
    expect(r.levels.every((l) => l.coefficientUncertainty === undefined)).toBe(true);
  });
});

describe('maxGridPoints reaches the potential solver', () => {
  it('a lower cap stops the solver short (a limits finding on the system), the default does not', () => {
    // The quartic's levels need more than 64 grid intervals for 1e-9 (measured), the solver's cap at maxGridPoints 1024.
    const text = 'system V(x) = x^4 over [-4, 4]\nstate gaussian(center = 0.5, width = 0.4)\nbasis 40\n';
    const limits = (r: ReturnType<typeof analyse>) => r.diagnostics.filter((d) => d.code === 'limits' && d.start === 0);
    expect(limits(analyse(text, timeless))).toEqual([]);
    expect(limits(analyse(text, { ...timeless, limits: { maxGridPoints: 1024 } }))).toHaveLength(1);
  });
});
