/**
 * Fair Brier score of ensemble forecasts: Ferro (2014), "Fair scores for ensemble forecasts", QJRMS
 * 140:1917-1923, eq. 8 (the Brier case); first given by Ferro, Richardson & Weigel (2008), "On the effect of
 * ensemble size on the discrete and continuous ranked probability scores", Meteorological Applications 15:19-24.
 * For an ensemble of m members of which i exceed the threshold and outcome o (0 or 1):
 *
 *     FBS = (i/m − o)² − i (m − i) / (m² (m − 1))
 *
 * Its expectation does not depend on m: it estimates the Brier score the same forecast system would reach with
 * an infinite ensemble, so 11-member hindcasts and 51-member forecasts are scored on one scale. Valid for m ≥ 2;
 * a case with m < 2 gives NaN. Probabilities are i/m, so the i (m − i) / m² term equals p (1 − p).
 */
type Vec = ArrayLike<number>;

/** Mean fair Brier score of probabilities p = i/m with member counts m and outcomes o (same length, no NaN). */
export function fairBrierScoreFerro2014(p: Vec, m: Vec, o: Vec): number {
  let s = 0;
  for (let k = 0; k < p.length; k++) {
    if (!(m[k] >= 2)) return Number.NaN;
    s += (p[k] - o[k]) ** 2 - (p[k] * (1 - p[k])) / (m[k] - 1);
  }
  return p.length === 0 ? Number.NaN : s / p.length;
}

/**
 * Fair Brier skill score against the sample climatology of the verification set: 1 − FBS / (s (1 − s)), s the
 * observed event frequency. NaN without both events and non-events. The reference is the plain Brier score of
 * the constant forecast s (a climatology is not an ensemble, so no adjustment applies to it).
 */
export function fairBrierSkillScore(p: Vec, m: Vec, o: Vec): number {
  let events = 0;
  for (let k = 0; k < o.length; k++) events += o[k];
  const s = events / o.length;
  const ref = s * (1 - s);
  return ref === 0 || o.length === 0 ? Number.NaN : 1 - fairBrierScoreFerro2014(p, m, o) / ref;
}
