/**
 * Verification scores of probability forecasts p (0..1) against binary outcomes o (0 or 1). Inputs are clean:
 * same length, no NaN (the skill module drops incomplete cases first). A score whose denominator is 0
 * (e.g. no events) is NaN, never 0.
 * Contingency convention: warn when p >= t; a = hits, b = false alarms, c = misses, d = correct negatives.
 */
import { ForelightError } from '../core/errors.ts';

type Vec = ArrayLike<number>;

function checkPair(p: Vec, o: Vec): number {
  if (p.length !== o.length) {
    throw new ForelightError(
      'calibrate',
      'verify-shape',
      `${p.length} forecasts but ${o.length} outcomes`,
      'pass one outcome per forecast',
    );
  }
  return p.length;
}

function baseRate(o: Vec): number {
  let s = 0;
  for (let i = 0; i < o.length; i++) s += o[i];
  return s / o.length;
}

/** Brier (1950), "Verification of forecasts expressed in terms of probability", Mon. Wea. Rev. 78:1-3: BS = mean (p - o)^2. */
export function brierScore1950(p: Vec, o: Vec): number {
  const n = checkPair(p, o);
  let s = 0;
  for (let i = 0; i < n; i++) s += (p[i] - o[i]) ** 2;
  return s / n;
}

/** Brier skill score against the sample climatology of the verification set: BSS = 1 - BS / (s (1 - s)). */
export function brierSkillScoreSampleClimatology(p: Vec, o: Vec): number {
  const s = baseRate(o);
  const ref = s * (1 - s);
  return ref === 0 ? Number.NaN : 1 - brierScore1950(p, o) / ref;
}

export interface ReliabilityRow {
  readonly forecastMean: number;
  readonly observedFrequency: number;
  readonly count: number;
}

/**
 * Reliability table. Without `binEdges`, one row per distinct forecast value (exact Murphy decomposition);
 * with ascending interior edges e1 < e2 < ..., bins [0,e1), [e1,e2), ..., [ek,1]. Empty bins are omitted.
 */
export function reliabilityTable(p: Vec, o: Vec, binEdges?: readonly number[]): ReliabilityRow[] {
  const n = checkPair(p, o);
  const keyOf = (x: number): number => {
    if (!binEdges) return x;
    let k = 0;
    while (k < binEdges.length && x >= binEdges[k]) k++;
    return k;
  };
  const bins = new Map<number, { sp: number; so: number; n: number }>();
  for (let i = 0; i < n; i++) {
    const k = keyOf(p[i]);
    const b = bins.get(k) ?? { sp: 0, so: 0, n: 0 };
    b.sp += p[i];
    b.so += o[i];
    b.n += 1;
    bins.set(k, b);
  }
  return [...bins.entries()]
    .sort((x, y) => x[0] - y[0])
    .map(([, b]) => ({ forecastMean: b.sp / b.n, observedFrequency: b.so / b.n, count: b.n }));
}

/**
 * Murphy (1973), "A new vector partition of the probability score", J. Appl. Meteor. 12:595-600:
 * BS = REL - RES + UNC with REL = (1/N) Σ n_k (p_k - ō_k)^2, RES = (1/N) Σ n_k (ō_k - s)^2, UNC = s(1 - s).
 * Exact with distinct-value bins; with `binEdges` p_k is the bin's mean forecast and the identity holds only
 * approximately (within-bin variance is left out).
 */
export function murphyDecomposition1973(
  p: Vec,
  o: Vec,
  binEdges?: readonly number[],
): { reliability: number; resolution: number; uncertainty: number } {
  const n = checkPair(p, o);
  const s = baseRate(o);
  let rel = 0;
  let res = 0;
  for (const row of reliabilityTable(p, o, binEdges)) {
    rel += row.count * (row.forecastMean - row.observedFrequency) ** 2;
    res += row.count * (row.observedFrequency - s) ** 2;
  }
  return { reliability: rel / n, resolution: res / n, uncertainty: s * (1 - s) };
}

export interface Contingency {
  readonly a: number;
  readonly b: number;
  readonly c: number;
  readonly d: number;
}

/** 2x2 table for "warn when p >= threshold". */
export function contingencyTable(p: Vec, o: Vec, threshold: number): Contingency {
  const n = checkPair(p, o);
  let a = 0,
    b = 0,
    c = 0,
    d = 0;
  for (let i = 0; i < n; i++) {
    const warn = p[i] >= threshold;
    if (o[i] === 1) warn ? a++ : c++;
    else warn ? b++ : d++;
  }
  return { a, b, c, d };
}

const ratio = (x: number, y: number): number => (y === 0 ? Number.NaN : x / y);

/** Hit rate (probability of detection) H = a / (a + c). */
export function hitRate(t: Contingency): number {
  return ratio(t.a, t.a + t.c);
}

/** False alarm RATE (probability of false detection) F = b / (b + d). */
export function falseAlarmRate(t: Contingency): number {
  return ratio(t.b, t.b + t.d);
}

/** False alarm RATIO FAR = b / (a + b) — not the false alarm rate. */
export function falseAlarmRatio(t: Contingency): number {
  return ratio(t.b, t.a + t.b);
}

/** Peirce (1884) skill score, also Hanssen-Kuipers discriminant: PSS = H - F. */
export function peirceSkillScore(t: Contingency): number {
  return hitRate(t) - falseAlarmRate(t);
}

export interface RocPoint {
  /** Warn when p >= threshold; Infinity for the (0,0) corner. */
  readonly threshold: number;
  readonly falseAlarmRate: number;
  readonly hitRate: number;
}

/** ROC points (F, H) for thresholds at every distinct forecast value, plus (0,0) and (1,1); F ascending. */
export function rocPoints(p: Vec, o: Vec): RocPoint[] {
  const n = checkPair(p, o);
  const idx = Array.from({ length: n }, (_, i) => i).sort((i, j) => p[j] - p[i]);
  let events = 0;
  for (let i = 0; i < n; i++) events += o[i];
  const nonEvents = n - events;
  const points: RocPoint[] = [{ threshold: Infinity, falseAlarmRate: 0, hitRate: 0 }];
  let a = 0,
    b = 0;
  for (let k = 0; k < n;) {
    const t = p[idx[k]];
    while (k < n && p[idx[k]] === t) {
      o[idx[k]] === 1 ? a++ : b++;
      k++;
    }
    points.push({ threshold: t, falseAlarmRate: ratio(b, nonEvents), hitRate: ratio(a, events) });
  }
  if (points[points.length - 1].falseAlarmRate !== 1 || points[points.length - 1].hitRate !== 1) {
    points.push({ threshold: -Infinity, falseAlarmRate: 1, hitRate: 1 });
  }
  return points;
}

/**
 * ROC area by the trapezoid rule over `rocPoints`; equals the Mann-Whitney U / (n1 n0) with ties counted 1/2
 * (Mason & Graham 2002, "Areas beneath the relative operating characteristics (ROC) and relative operating
 * levels (ROL) curves", QJRMS 128:2145-2166). NaN without both events and non-events.
 */
export function rocArea(p: Vec, o: Vec): number {
  const pts = rocPoints(p, o);
  let area = 0;
  for (let k = 1; k < pts.length; k++) {
    area += ((pts[k].falseAlarmRate - pts[k - 1].falseAlarmRate) * (pts[k].hitRate + pts[k - 1].hitRate)) / 2;
  }
  return area;
}

/**
 * Relative economic value, Richardson (2000), "Skill and relative economic value of the ECMWF ensemble
 * prediction system", QJRMS 126:649-667, for cost/loss ratio alpha = C/L and base rate s:
 * E_clim = min(alpha, s), E_perfect = s alpha, E_fc = F alpha (1 - s) - H s (1 - alpha) + s,
 * V = (E_clim - E_fc) / (E_clim - E_perfect). 1 = perfect, 0 = no better than always/never protecting,
 * unbounded below; NaN when s is 0 or 1.
 */
export function relativeEconomicValueRichardson2000(hit: number, falseAlarm: number, s: number, alpha: number): number {
  const eClim = Math.min(alpha, s);
  const ePerfect = s * alpha;
  const eFc = falseAlarm * alpha * (1 - s) - hit * s * (1 - alpha) + s;
  return ratio(eClim - eFc, eClim - ePerfect);
}

export interface ValuePoint {
  readonly alpha: number;
  /** Best value over probability thresholds (the envelope). */
  readonly value: number;
  /** The probability threshold (warn when p >= it) that reaches it. */
  readonly threshold: number;
  readonly hitRate: number;
  readonly falseAlarmRate: number;
}

/**
 * Value of probability forecasts at cost/loss `alpha` with the best warning threshold among the distinct forecast
 * values (Richardson 2000, section on probability forecasts). On equal value the higher threshold (fewer
 * warnings) is kept.
 */
export function bestProbabilityThreshold(p: Vec, o: Vec, alpha: number): ValuePoint {
  return bestThresholdOnRoc(rocPoints(p, o), baseRate(o), alpha);
}

/** `bestProbabilityThreshold` from ROC points already computed (`rocPoints`) and the cases' base rate s. */
export function bestThresholdOnRoc(points: readonly RocPoint[], s: number, alpha: number): ValuePoint {
  let best: ValuePoint = { alpha, value: Number.NaN, threshold: Number.NaN, hitRate: Number.NaN, falseAlarmRate: Number.NaN };
  for (const pt of points) {
    // p >= 0 is "always warn": a trigger that fires whatever the forecast says is no trigger (its value is 0
    // by construction, Richardson 2000), so only thresholds above 0 are candidates.
    if (!Number.isFinite(pt.threshold) || pt.threshold <= 0) continue;
    const v = relativeEconomicValueRichardson2000(pt.hitRate, pt.falseAlarmRate, s, alpha);
    if (Number.isNaN(best.value) || v > best.value) {
      best = { alpha, value: v, threshold: pt.threshold, hitRate: pt.hitRate, falseAlarmRate: pt.falseAlarmRate };
    }
  }
  return best;
}

/** Cost/loss ratios 0.05, 0.10, ..., 0.95 of the value curve in the skill report. */
export const VALUE_ALPHAS: readonly number[] = Array.from({ length: 19 }, (_, i) => Math.round((i + 1) * 5) / 100);

/** Value envelope of probability forecasts over the given cost/loss ratios. */
export function valueEnvelope(p: Vec, o: Vec, alphas: readonly number[] = VALUE_ALPHAS): ValuePoint[] {
  return alphas.map((alpha) => bestProbabilityThreshold(p, o, alpha));
}
