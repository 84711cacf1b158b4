/**
 * sin(k theta) and cos(k theta) for k = 1 ... K at one angle, the inner kernel of every sine-series
 * evaluation (box levels, sine-DVR levels, their fused projections).
 */

/**
 * Fills s[k] = sin(k theta) and c[k] = cos(k theta) for k = 1 ... count by the angle-addition
 * recurrence (a rotation by theta per step, so the rounding error stays free of 1/sin(theta)),
 * restarted from Math.sin and Math.cos every 32 terms so it grows no further than 32 steps
 * (common practice). s and c need length count + 1; index 0 is left alone.
 */
export function sineLadder(theta: number, count: number, s: Float64Array, c: Float64Array): void {
  const s1 = Math.sin(theta);
  const c1 = Math.cos(theta);
  let sk = 0;
  let ck = 1;
  for (let k = 1; k <= count; k++) {
    if ((k & 31) === 1) {
      sk = Math.sin(k * theta);
      ck = Math.cos(k * theta);
    } else {
      const sn = sk * c1 + ck * s1;
      ck = ck * c1 - sk * s1;
      sk = sn;
    }
    s[k] = sk;
    c[k] = ck;
  }
}
