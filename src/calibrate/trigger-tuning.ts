/**
 * Cost/loss triggers judged out of sample. For a cost/loss ratio alpha the trigger "warn when p >= t" of maximum
 * relative economic value (Richardson 2000, "Skill and relative economic value of the ECMWF ensemble prediction
 * system", QJRMS 126:649-667) is chosen on the hindcast cases of every year but one and judged on that left-out
 * year (leave-one-year-out; Wilks, "Statistical Methods in the Atmospheric Sciences", 3rd ed., 7.4.4 (from memory) on
 * cross-validation): the value printed is the value of decisions whose threshold never saw their own year. Its 90 %
 * interval is a year-block bootstrap (bootstrap.ts) of those out-of-sample decisions; the threshold choice is not
 * repeated inside each resample, so the interval covers the sampling of the years judged, not of the tuning.
 * The threshold used operationally is the one chosen on all years.
 *
 * Ensemble size: the tuned threshold is "at least k of the hindcast's n members". A forecast with another number
 * of members is compared with the member-count-free probability q* at which an n-member ensemble drawn from the
 * forecast's distribution reaches k members exactly half the time: P(Binomial(n, q*) >= k) = 1/2, i.e. q* is the
 * median of the Beta(k, n - k + 1) distribution (the binomial tail is a regularized incomplete beta function;
 * Abramowitz & Stegun 1964, 26.5.24, from memory; the test checks it against scipy). A forecast fires when its
 * member fraction is at least q*: with n members this is exactly "k of n" (q* lies strictly between (k - 1)/n and
 * k/n), with 50 members it is the fraction an n-member resample of it would reach more often than not, instead of
 * the bare k/n (1 of 10 members is not 5 of 50). See DECISIONS.md for why this and not a random resample.
 */
import { percentileLinear } from '../core/percentile.ts';
import { concatCases, type Interval, type VerificationCases } from './bootstrap.ts';
import { mulberry32 } from './seeded-random.ts';
import { bestThresholdOnRoc, relativeEconomicValueRichardson2000, rocPoints } from './verify.ts';

export interface OutOfSampleValue {
  readonly alpha: number;
  /** Relative economic value of the leave-one-year-out decisions (NaN without both events and non-events). */
  readonly value: number;
  /** 90 % year-block bootstrap interval of that value. */
  readonly interval: Interval;
  readonly hitRate: number;
  readonly falseAlarmRate: number;
  /** Value of the threshold chosen and judged on all years (in-sample, optimistic). */
  readonly inSampleValue: number;
  /** Threshold chosen on all years: warn when p >= it (NaN when none has value). */
  readonly threshold: number;
}

export interface ResampleOptions {
  readonly resamples: number;
  readonly seed: number;
}

const NO_INTERVAL: Interval = { low: Number.NaN, high: Number.NaN };

/**
 * Out-of-sample warnings per cost/loss ratio: case k is warned when p_k >= the threshold of maximum value chosen on
 * the cases of the other years. A year whose other years give no threshold with value (e.g. no event there) is
 * never warned.
 */
export function leaveOneYearOutWarnings(cases: VerificationCases, alphas: readonly number[]): Uint8Array[] {
  const n = cases.p.length;
  const warn = alphas.map(() => new Uint8Array(n));
  for (const year of cases.years) {
    const train: { p: number[]; o: number[] } = { p: [], o: [] };
    for (let k = 0; k < n; k++) {
      if (cases.caseYears[k] === year) continue;
      train.p.push(cases.p[k]);
      train.o.push(cases.o[k]);
    }
    const points = rocPoints(train.p, train.o);
    const s = train.o.reduce((x, y) => x + y, 0) / train.o.length;
    alphas.forEach((alpha, j) => {
      const best = train.p.length > 0 ? bestThresholdOnRoc(points, s, alpha) : null;
      const t = best && Number.isFinite(best.value) ? best.threshold : Number.NaN;
      for (let k = 0; k < n; k++) if (cases.caseYears[k] === year) warn[j][k] = Number.isFinite(t) && cases.p[k] >= t ? 1 : 0;
    });
  }
  return warn;
}

/** Richardson (2000) value, hit rate and false-alarm rate of a table [hits, false alarms, misses, correct negatives]. */
function tableValue([a, b, c, d]: readonly number[], alpha: number): [number, number, number] {
  const events = a + c;
  const n = a + b + c + d;
  if (events === 0 || events === n) return [Number.NaN, Number.NaN, Number.NaN];
  const h = a / events;
  const f = b / (b + d);
  return [relativeEconomicValueRichardson2000(h, f, events / n, alpha), h, f];
}

/** Contingency table of fixed warnings per year position (4 numbers per year: a, b, c, d). */
function tablesByYear(cases: VerificationCases, warn: Uint8Array): Float64Array {
  const yearIndex = new Map(cases.years.map((y, i) => [y, i]));
  const t = new Float64Array(cases.years.length * 4);
  for (let k = 0; k < warn.length; k++) {
    const cell = cases.o[k] === 1 ? (warn[k] ? 0 : 2) : warn[k] ? 1 : 3;
    t[(yearIndex.get(cases.caseYears[k]) as number) * 4 + cell]++;
  }
  return t;
}

/**
 * 90 % percentile interval (type 7) of the value over year-block resamples of fixed warnings: each resample adds
 * the tables of as many years, drawn with replacement, as there are. Resamples without both events and non-events
 * have no value and are left out.
 */
function valueInterval(byYear: Float64Array, nYears: number, alpha: number, options: ResampleOptions): Interval {
  if (nYears === 0 || options.resamples <= 0) return NO_INTERVAL;
  const rand = mulberry32(options.seed);
  const sum = [0, 0, 0, 0];
  const values: number[] = [];
  for (let r = 0; r < options.resamples; r++) {
    sum.fill(0);
    for (let j = 0; j < nYears; j++) {
      const y = Math.floor(rand() * nYears);
      for (let cell = 0; cell < 4; cell++) sum[cell] += byYear[y * 4 + cell];
    }
    const v = tableValue(sum, alpha)[0];
    if (Number.isFinite(v)) values.push(v);
  }
  return values.length === 0 ? NO_INTERVAL : { low: percentileLinear(values, 5), high: percentileLinear(values, 95) };
}

/** The out-of-sample value curve over cost/loss ratios, with the operational (all-years) threshold of each. */
export function outOfSampleValueCurve(cases: VerificationCases, alphas: readonly number[], options: ResampleOptions): OutOfSampleValue[] {
  const warnings = leaveOneYearOutWarnings(cases, alphas);
  const points = rocPoints(cases.p, cases.o);
  const s = cases.o.reduce((x, y) => x + y, 0) / cases.o.length;
  return alphas.map((alpha, j) => {
    const byYear = tablesByYear(cases, warnings[j]);
    const total = [0, 1, 2, 3].map((cell) => byYear.reduce((acc, v, i) => (i % 4 === cell ? acc + v : acc), 0));
    const [value, hitRate, falseAlarmRate] = tableValue(total, alpha);
    const best = cases.p.length > 0 ? bestThresholdOnRoc(points, s, alpha) : null;
    const all = best && Number.isFinite(best.value) ? best : { value: Number.NaN, threshold: Number.NaN };
    return {
      alpha,
      value,
      interval: Number.isFinite(value) ? valueInterval(byYear, cases.years.length, alpha, options) : NO_INTERVAL,
      hitRate,
      falseAlarmRate,
      inSampleValue: all.value,
      threshold: all.threshold,
    };
  });
}

/** P(Binomial(n, q) >= k) for 0 <= k <= n. */
export function binomialTail(n: number, k: number, q: number): number {
  if (k <= 0 || q >= 1) return k <= n ? 1 : 0;
  if (k > n || q <= 0) return 0;
  let term = (1 - q) ** n; // P(X = 0)
  let below = 0;
  for (let j = 0; j < k; j++) {
    below += term;
    term = (term * (n - j) * q) / ((j + 1) * (1 - q));
  }
  return Math.min(1, Math.max(0, 1 - below));
}

/**
 * Member-count-free threshold of "at least k of n members": the q with P(Binomial(n, q) >= k) = 1/2 (the median of
 * Beta(k, n - k + 1)), by bisection to 1e-12. Valid for 1 <= k <= n; 0 for k <= 0.
 */
export function memberCountFreeThreshold(k: number, n: number): number {
  if (k <= 0) return 0;
  let lo = 0,
    hi = 1;
  while (hi - lo > 1e-12) {
    const mid = (lo + hi) / 2;
    if (binomialTail(n, k, mid) >= 0.5) hi = mid;
    else lo = mid;
  }
  return hi;
}

/** The most frequent valid member count among the cases (the hindcast ensemble size the thresholds are counts of). */
export function typicalMembers(cases: VerificationCases): number {
  const counts = new Map<number, number>();
  for (const m of cases.members) counts.set(m, (counts.get(m) ?? 0) + 1);
  let best = Number.NaN,
    most = 0;
  for (const [m, c] of counts) if (c > most || (c === most && m > best)) [best, most] = [m, c];
  return best;
}

/** A cost/loss rule's trigger tuned on the hindcast cases of its leads. */
export interface TunedTrigger {
  readonly costLoss: number;
  /** "observed" when every case is verified against observations; perfect-model cases are never mixed in. */
  readonly basis: 'observed' | 'potential';
  /** Lead indices pooled. */
  readonly leads: readonly number[];
  readonly cases: number;
  readonly events: number;
  readonly years: number;
  /** Hindcast ensemble size n and count k of "warn when at least k of n members exceed". */
  readonly hindcastMembers: number;
  readonly hindcastCount: number;
  /** Member-count-free threshold q* the forecast's member fraction is compared with. */
  readonly forecastThreshold: number;
  /** Value of the threshold chosen on all years, and of leave-one-year-out decisions with its interval. */
  readonly value: OutOfSampleValue;
}

/**
 * Tune a cost/loss trigger on the cases of its leads, pooled (one tier). Observed cases are used where any lead
 * has them, perfect-model cases only when none has. Null when no threshold has value on the hindcasts.
 */
export function tuneTrigger(
  leads: readonly { index: number; basis: 'observed' | 'potential'; cases: VerificationCases }[],
  costLoss: number,
  options: ResampleOptions,
): TunedTrigger | null {
  const basis = leads.some((l) => l.basis === 'observed') ? 'observed' : 'potential';
  const used = leads.filter((l) => l.basis === basis);
  if (used.length === 0) return null;
  const cases = concatCases(used.map((l) => l.cases));
  const [value] = outOfSampleValueCurve(cases, [costLoss], options);
  if (!Number.isFinite(value.inSampleValue)) return null;
  const n = typicalMembers(cases);
  const k = Math.ceil(value.threshold * n - 1e-9);
  return {
    costLoss,
    basis,
    leads: used.map((l) => l.index),
    cases: cases.p.length,
    events: cases.o.reduce((a, b) => a + b, 0),
    years: cases.years.length,
    hindcastMembers: n,
    hindcastCount: k,
    forecastThreshold: memberCountFreeThreshold(k, n),
    value,
  };
}
