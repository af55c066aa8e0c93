/**
 * Student's t distribution for whole degrees of freedom: the two-sided probability A(t | ν) = P(|T| < t) by the
 * finite series of Abramowitz and Stegun, "Handbook of Mathematical Functions" (1964), 26.7.3 (ν odd) and 26.7.4
 * (ν even), with θ = atan(t / √ν) (from memory; checked against scipy.stats.t in
 * test/calibrate/trend-climate.test.ts), and its quantile by bisection.
 */

/** P(|T| < t) for T ~ Student t with ν ≥ 1 degrees of freedom, t ≥ 0. */
export function twoSidedT(t: number, nu: number): number {
  const theta = Math.atan(t / Math.sqrt(nu));
  const [s, c2] = [Math.sin(theta), Math.cos(theta) ** 2];
  if (nu % 2 === 0) {
    // sin θ {1 + (1/2) cos²θ + (1·3)/(2·4) cos⁴θ + … up to cos^(ν−2) θ}
    let [term, sum] = [1, 1];
    for (let k = 2; k <= nu - 2; k += 2) sum += term *= (c2 * (k - 1)) / k;
    return s * sum;
  }
  // (2/π) {θ + sin θ cos θ [1 + (2/3) cos²θ + … up to cos^(ν−3) θ]} for ν > 1; (2/π) θ for ν = 1
  let [term, sum] = [1, nu > 1 ? 1 : 0];
  for (let k = 3; k <= nu - 2; k += 2) sum += term *= (c2 * (k - 1)) / k;
  return (2 / Math.PI) * (theta + s * Math.sqrt(c2) * sum);
}

/** The t with P(T ≤ t) = p (p in [0.5, 1)), ν whole: bisection on the two-sided series to 1e-12. */
export function studentTQuantile(p: number, nu: number): number {
  const target = 2 * p - 1;
  let [lo, hi] = [0, 1];
  while (twoSidedT(hi, nu) < target) hi *= 2;
  while (hi - lo > 1e-12) {
    const mid = (lo + hi) / 2;
    if (twoSidedT(mid, nu) < target) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}
