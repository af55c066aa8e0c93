/**
 * Ranked probability score of K ordered categories (Epstein 1969, J. Appl. Meteor. 8:985-987; Murphy 1971,
 * J. Appl. Meteor. 10:155-156), unnormalised:  RPS = Σ_{k=1..K} (F_k − O_k)²  with F, O the cumulative forecast
 * and observed (0/1) distributions. 0 is perfect; a climatological forecast of equal thirds scores 2/9 when the
 * middle category occurs and 5/9 otherwise. Skill score against climatology: RPSS = 1 − ⟨RPS⟩/⟨RPS_clim⟩.
 * Ensemble-size debiased RPSS of Weigel, Liniger & Appenzeller (2007, Mon. Wea. Rev. 135:118-124):
 *     RPSS_D = 1 − ⟨RPS⟩ / (⟨RPS_clim⟩ + D),   D = (1/M) Σ_{k=1..K−1} P_k (1 − P_k)
 * P_k the cumulative climatological probabilities (equal thirds: D = 4/(9M)); with members varying by case the
 * per-case D is averaged (our extension). A small ensemble of a climatological forecast then scores ~0 instead
 * of a negative RPSS. Valid range: probabilities 0..1 summing to 1, observed category 0..K−1, M ≥ 1.
 * Year-block bootstrap interval of RPSS_D: whole years drawn with replacement (as bootstrap.ts), 90 % percentile
 * interval (type 7), seeded mulberry32.
 */
import { percentileLinear } from '../core/percentile.ts';
import type { Interval } from './bootstrap.ts';
import { mulberry32 } from './seeded-random.ts';

/** Categorical forecast cases: K probabilities per case (case-major), observed category, members, year. */
export interface CategoryCases {
  readonly categories: number;
  readonly probabilities: Float64Array;
  readonly observed: Int32Array;
  readonly members: Float64Array;
  readonly caseYears: Float64Array;
}

export interface RpssResult {
  readonly cases: number;
  readonly rps: number;
  readonly rpsClimate: number;
  readonly rpss: number;
  readonly rpssDebiased: number;
}

/** RPS of one forecast (K probabilities) against observed category `observed` (0-based). */
export function rankedProbabilityScore(probabilities: ArrayLike<number>, observed: number): number {
  let cumF = 0;
  let rps = 0;
  for (let k = 0; k < probabilities.length; k++) {
    cumF += probabilities[k];
    rps += (cumF - (k >= observed ? 1 : 0)) ** 2;
  }
  return rps;
}

function equalClimate(k: number): number[] {
  return Array.from({ length: k }, () => 1 / k);
}

/** Weigel et al. (2007) D for an M-member ensemble and climatological category probabilities. */
export function rpssDebiasTerm(members: number, climate: readonly number[]): number {
  let cum = 0;
  let sum = 0;
  for (let k = 0; k < climate.length - 1; k++) {
    cum += climate[k];
    sum += cum * (1 - cum);
  }
  return sum / members;
}

/** Weighted sums of one case set (weights = times each case is drawn). */
function weightedRpss(c: CategoryCases, w: ArrayLike<number>, climate: readonly number[]): RpssResult {
  const K = c.categories;
  let n = 0,
    rps = 0,
    clim = 0,
    d = 0;
  for (let i = 0; i < c.observed.length; i++) {
    if (w[i] === 0) continue;
    n += w[i];
    rps += w[i] * rankedProbabilityScore(c.probabilities.subarray(i * K, (i + 1) * K), c.observed[i]);
    clim += w[i] * rankedProbabilityScore(climate, c.observed[i]);
    d += w[i] * rpssDebiasTerm(c.members[i], climate);
  }
  if (n === 0) return { cases: 0, rps: NaN, rpsClimate: NaN, rpss: NaN, rpssDebiased: NaN };
  return { cases: n, rps: rps / n, rpsClimate: clim / n, rpss: 1 - rps / clim, rpssDebiased: 1 - rps / n / (clim / n + d / n) };
}

/** Mean RPS, climatological RPS, RPSS and debiased RPSS_D of the cases (climate: equal categories by default). */
export function rankedProbabilitySkill(c: CategoryCases, climate: readonly number[] = equalClimate(c.categories)): RpssResult {
  return weightedRpss(c, new Float64Array(c.observed.length).fill(1), climate);
}

/** 90 % year-block bootstrap interval of RPSS_D. */
export function rpssBootstrap(
  c: CategoryCases,
  options: { readonly resamples: number; readonly seed: number },
  climate: readonly number[] = equalClimate(c.categories),
): Interval {
  const years = [...new Set(c.caseYears)].sort((a, b) => a - b);
  if (years.length === 0 || options.resamples <= 0) return { low: NaN, high: NaN };
  const index = new Map(years.map((y, i) => [y, i]));
  const caseYear = Int32Array.from(c.caseYears, (y) => index.get(y) as number);
  const drawn = new Float64Array(years.length);
  const w = new Float64Array(c.observed.length);
  const rand = mulberry32(options.seed);
  const scores: number[] = [];
  for (let r = 0; r < options.resamples; r++) {
    drawn.fill(0);
    for (let j = 0; j < years.length; j++) drawn[Math.floor(rand() * years.length)]++;
    for (let i = 0; i < w.length; i++) w[i] = drawn[caseYear[i]];
    const s = weightedRpss(c, w, climate).rpssDebiased;
    if (Number.isFinite(s)) scores.push(s);
  }
  return scores.length === 0 ? { low: NaN, high: NaN } : { low: percentileLinear(scores, 5), high: percentileLinear(scores, 95) };
}
