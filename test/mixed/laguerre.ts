/**
 * An independent computation of the displaced thermal populations, for the tests: exact rational
 * arithmetic (BigInt) for each matrix element, where the Laguerre polynomial's alternating sum cancels,
 * and a plain double sum of the positive terms after that.
 *
 * Displaced number states (Cahill & Glauber, Phys. Rev. 177, 1857 (1969), from memory; /work CHECKS list):
 * |<n|D(alpha)|k>|^2 = (m!/M!) a^(M - m) e^(-a) [L_m^(M - m)(a)]^2 with a = |alpha|^2, m = min(n, k),
 * M = max(n, k), and L_m^(j)(a) = sum_i (-1)^i C(m + j, m - i) a^i / i!. A thermal state displaced by
 * alpha has P_n = sum_k p_k |<n|D(alpha)|k>|^2 with p_k = nbar^k / (nbar + 1)^(k + 1).
 */

/** A non-negative or negative rational num/den with den > 0. */
interface Q {
  num: bigint;
  den: bigint;
}

function gcd(a: bigint, b: bigint): bigint {
  a = a < 0n ? -a : a;
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
}
const q = (num: bigint, den = 1n): Q => {
  const g = gcd(num, den) || 1n;
  return { num: num / g, den: den / g };
};
const add = (x: Q, y: Q): Q => q(x.num * y.den + y.num * x.den, x.den * y.den);
const mul = (x: Q, y: Q): Q => q(x.num * y.num, x.den * y.den);

/** A rational to the nearest double (to about 1e-17 relative). */
function toNumber(x: Q): number {
  if (x.num === 0n) return 0;
  const shift = BigInt(Math.max(0, 64 - (x.num.toString(2).length - x.den.toString(2).length)));
  return Number((x.num << shift) / x.den) / 2 ** Number(shift);
}

function binomial(n: number, k: number): bigint {
  let r = 1n;
  for (let i = 1; i <= k; i++) r = (r * BigInt(n - k + i)) / BigInt(i);
  return r;
}

function laguerre(m: number, j: number, a: Q): Q {
  let s = q(0n);
  let power = q(1n); // a^i / i!
  for (let i = 0; i <= m; i++) {
    const term = mul(power, q(binomial(m + j, m - i)));
    s = add(s, i % 2 === 0 ? term : { num: -term.num, den: term.den });
    power = mul(power, q(a.num, a.den * BigInt(i + 1)));
  }
  return s;
}

/** e^a |<n|D|k>|^2 as an exact rational (the factor e^(-a) is applied in doubles). */
function elementSquared(n: number, k: number, a: Q): Q {
  const m = Math.min(n, k);
  const M = Math.max(n, k);
  let ratio = q(1n); // m!/M!
  for (let i = m + 1; i <= M; i++) ratio = q(ratio.num, ratio.den * BigInt(i));
  let ap = q(1n);
  for (let i = 0; i < M - m; i++) ap = mul(ap, a);
  const L = laguerre(m, M - m, a);
  return mul(mul(ratio, ap), mul(L, L));
}

/**
 * P_0 .. P_{count-1} of a thermal state with mean occupation nbarNum/nbarDen displaced by a = aNum/aDen,
 * summed over k < terms (the thermal tail beyond is (nbar/(nbar+1))^terms).
 */
export function displacedThermal(nbar: [bigint, bigint], a: [bigint, bigint], count: number, terms: number): number[] {
  const aq = q(a[0], a[1]);
  const nb = q(nbar[0], nbar[1]);
  const ratio = q(nb.num * 1n, nb.num + nb.den); // nbar / (nbar + 1)
  const p0 = q(nb.den, nb.num + nb.den); // 1 / (nbar + 1)
  const out: number[] = [];
  for (let n = 0; n < count; n++) {
    let sum = 0;
    let pk = p0;
    for (let k = 0; k < terms; k++) {
      sum += toNumber(mul(pk, elementSquared(n, k, aq)));
      pk = mul(pk, ratio);
    }
    out.push(sum * Math.exp(-toNumber(aq)));
  }
  return out;
}
