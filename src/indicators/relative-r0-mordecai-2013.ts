/**
 * Temperature-dependent relative basic reproduction number of P. falciparum malaria, Mordecai et al. (2013)
 * [mordecai2013], with Brière (1999) [briere1999] and quadratic thermal-performance fits of each trait:
 *
 *     Briere(T; c, T0, Tm) = c T (T − T0) sqrt(Tm − T) for T0 < T < Tm, else 0;  quadratics set to 0 where negative
 *     a = Briere(2.03e-4, 11.7, 42.3)   bc = −0.54T² + 25.2T − 206   p = −0.000828T² + 0.0367T + 0.522, μ = −ln p
 *     PDR = Briere(1.11e-4, 14.7, 34.4)  pEA = −0.00924T² + 0.453T − 4.77  MDR = Briere(1.11e-4, 14.7, 34.0)
 *     EFD = −0.153T² + 8.61T − 97.7
 *     R0(T) ∝ sqrt(a² bc exp(−μ/PDR) EFD pEA MDR / μ³),   relative R0 = R0(T) / max_T R0
 *
 * T mean temperature °C. Trait parameters are FROM MEMORY (CHECKS.md §10, code M; they match a third-party
 * re-implementation): check Table 1 of the paper before relying on digits beyond the optimum (≈25.6 °C) and the
 * limits (R0 > 0 between ≈15.76 and ≈33.71 °C). Valid range: any finite T (0 outside the limits).
 */

function briere(tC: number, c: number, t0: number, tm: number): number {
  return tC > t0 && tC < tm ? c * tC * (tC - t0) * Math.sqrt(tm - tC) : 0;
}

function positiveQuadratic(tC: number, a2: number, a1: number, a0: number): number {
  return Math.max(0, a2 * tC * tC + a1 * tC + a0);
}

/** R0(T) up to a constant factor (unscaled). */
export function r0UnscaledMordecai2013(tC: number): number {
  if (Number.isNaN(tC)) return NaN;
  const a = briere(tC, 2.03e-4, 11.7, 42.3);
  const bc = positiveQuadratic(tC, -0.54, 25.2, -206);
  const p = positiveQuadratic(tC, -0.000828, 0.0367, 0.522);
  const pdr = briere(tC, 1.11e-4, 14.7, 34.4);
  const pea = positiveQuadratic(tC, -0.00924, 0.453, -4.77);
  const mdr = briere(tC, 1.11e-4, 14.7, 34.0);
  const efd = positiveQuadratic(tC, -0.153, 8.61, -97.7);
  if (p <= 0 || p >= 1 || pdr <= 0) return 0;
  const mu = -Math.log(p);
  return Math.sqrt((a * a * bc * Math.exp(-mu / pdr) * efd * pea * mdr) / (mu * mu * mu));
}

export interface R0Profile {
  /** Temperature of maximum R0, °C. */
  readonly tOptC: number;
  /** Lowest and highest temperature with R0 > 0 on the grid, °C. */
  readonly tMinC: number;
  readonly tMaxC: number;
  readonly maxR0: number;
}

/** Scan 10..40 °C with the given step (°C) for the optimum and the limits of R0 > 0. */
export function r0ProfileMordecai2013(stepC = 0.001): R0Profile {
  const n = Math.round(30 / stepC);
  let tOptC = NaN;
  let maxR0 = 0;
  let tMinC = NaN;
  let tMaxC = NaN;
  for (let i = 0; i <= n; i++) {
    const t = 10 + i * stepC;
    const r = r0UnscaledMordecai2013(t);
    if (r > 0) {
      if (Number.isNaN(tMinC)) tMinC = t;
      tMaxC = t;
    }
    if (r > maxR0) {
      maxR0 = r;
      tOptC = t;
    }
  }
  return { tOptC, tMinC, tMaxC, maxR0 };
}

const PROFILE = r0ProfileMordecai2013();

/** Relative R0(T) = R0(T)/max R0, 0..1. */
export function relativeR0Mordecai2013(tC: number): number {
  return r0UnscaledMordecai2013(tC) / PROFILE.maxR0;
}
