/**
 * Year-block bootstrap intervals of verification scores. Cases of one year (several pooled starts, several
 * pooled leads) share that year's weather, so they are not independent: a resample draws whole years with
 * replacement, as many as there are, and keeps every case of each drawn year (block bootstrap, Efron &
 * Tibshirani 1993, "An Introduction to the Bootstrap", ch. 8.6; for forecast verification Wilks, "Statistical
 * Methods in the Atmospheric Sciences", 3rd ed., section 5.3.5). The interval is the percentile interval:
 * the 5th and 95th percentiles (Hyndman-Fan type 7) of the resampled scores, a 90 % interval. A resample
 * without both events and non-events has no score; those are counted (`degenerate`) and left out of the
 * percentiles. Randomness is seeded (mulberry32), so an interval is reproducible.
 */
import { percentileLinear } from '../core/percentile.ts';
import { mulberry32 } from './seeded-random.ts';

/** Verification cases: forecast probability, valid member count, outcome and year of each case. */
export interface VerificationCases {
  readonly p: Float64Array;
  readonly members: Float64Array;
  readonly o: Float64Array;
  readonly caseYears: Float64Array;
  /** Distinct years, ascending. */
  readonly years: readonly number[];
}

export interface Interval {
  readonly low: number;
  readonly high: number;
}

export interface BootstrapIntervals {
  readonly brierSkillScore: Interval;
  readonly fairBrierSkillScore: Interval;
  readonly rocArea: Interval;
  readonly resamples: number;
  /** Resamples without both events and non-events (no score). */
  readonly degenerate: number;
}

export interface BootstrapOptions {
  readonly resamples: number;
  readonly seed: number;
}

const NO_INTERVAL: Interval = { low: Number.NaN, high: Number.NaN };

function interval(values: readonly number[]): Interval {
  const finite = values.filter(Number.isFinite);
  return finite.length === 0 ? NO_INTERVAL : { low: percentileLinear(finite, 5), high: percentileLinear(finite, 95) };
}

/** Concatenation of the given cases (e.g. the leads of a pooling window). */
export function concatCases(sets: readonly VerificationCases[]): VerificationCases {
  const cat = (pick: (c: VerificationCases) => Float64Array): Float64Array => {
    const out = new Float64Array(sets.reduce((n, c) => n + pick(c).length, 0));
    let at = 0;
    for (const c of sets) {
      out.set(pick(c), at);
      at += pick(c).length;
    }
    return out;
  };
  const years = [...new Set(sets.flatMap((c) => c.years))].sort((a, b) => a - b);
  return { p: cat((c) => c.p), members: cat((c) => c.members), o: cat((c) => c.o), caseYears: cat((c) => c.caseYears), years };
}

/**
 * Scores of one resample given as case weights w (times each case was drawn): BSS, fair BSS and the ROC area
 * as the Mann-Whitney statistic with ties counted 1/2 (Mason & Graham 2002), over cases pre-sorted by p
 * (`order`, tie groups in `groupEnd`). O(n) per resample; equal to verify.ts/fair-brier.ts on the expanded
 * sample (test/calibrate/bootstrap.test.ts).
 */
function weightedScores(c: VerificationCases, w: Float64Array, order: Int32Array, groupEnd: Int32Array): [number, number, number] | null {
  let n = 0,
    events = 0,
    bs = 0,
    fair = 0;
  for (let k = 0; k < w.length; k++) {
    if (w[k] === 0) continue;
    const d = (c.p[k] - c.o[k]) ** 2;
    n += w[k];
    events += w[k] * c.o[k];
    bs += w[k] * d;
    fair += w[k] * (d - (c.p[k] * (1 - c.p[k])) / (c.members[k] - 1));
  }
  if (events === 0 || events === n) return null;
  const s = events / n;
  const ref = s * (1 - s);
  let auc = 0,
    below = 0;
  for (let g = 0, start = 0; g < groupEnd.length; start = groupEnd[g], g++) {
    let e = 0,
      ne = 0;
    for (let j = start; j < groupEnd[g]; j++) {
      const k = order[j];
      e += w[k] * c.o[k];
      ne += w[k] * (1 - c.o[k]);
    }
    auc += e * (below + ne / 2);
    below += ne;
  }
  return [1 - bs / n / ref, 1 - fair / n / ref, auc / (events * (n - events))];
}

/** 90 % year-block bootstrap intervals of BSS, fair BSS and ROC area. */
export function yearBlockBootstrap(cases: VerificationCases, options: BootstrapOptions): BootstrapIntervals {
  const nYears = cases.years.length;
  if (nYears === 0 || options.resamples <= 0) {
    return { brierSkillScore: NO_INTERVAL, fairBrierSkillScore: NO_INTERVAL, rocArea: NO_INTERVAL, resamples: 0, degenerate: 0 };
  }
  const n = cases.p.length;
  const yearIndex = new Map(cases.years.map((y, i) => [y, i]));
  const caseYear = Int32Array.from(cases.caseYears, (y) => yearIndex.get(y) as number);
  const order = Int32Array.from({ length: n }, (_, i) => i).sort((i, j) => cases.p[i] - cases.p[j]);
  const ends: number[] = [];
  for (let j = 1; j <= n; j++) if (j === n || cases.p[order[j]] !== cases.p[order[j - 1]]) ends.push(j);
  const groupEnd = Int32Array.from(ends);
  const drawn = new Float64Array(nYears);
  const w = new Float64Array(n);
  const rand = mulberry32(options.seed);
  const bss: number[] = [];
  const fair: number[] = [];
  const auc: number[] = [];
  let degenerate = 0;
  for (let r = 0; r < options.resamples; r++) {
    drawn.fill(0);
    for (let j = 0; j < nYears; j++) drawn[Math.floor(rand() * nYears)]++;
    for (let k = 0; k < n; k++) w[k] = drawn[caseYear[k]];
    const scores = weightedScores(cases, w, order, groupEnd);
    if (scores === null) {
      degenerate++;
      continue;
    }
    bss.push(scores[0]);
    fair.push(scores[1]);
    auc.push(scores[2]);
  }
  return {
    brierSkillScore: interval(bss),
    fairBrierSkillScore: interval(fair),
    rocArea: interval(auc),
    resamples: options.resamples,
    degenerate,
  };
}
