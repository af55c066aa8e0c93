/**
 * Daily survival probability of adult Anopheles, Martens (1997) [martens1997]:
 *
 *     p(T) = exp(−1 / (−4.4 + 1.31 T − 0.03 T²))    T daily (or monthly) mean temperature, °C
 *
 * The quadratic is the mean life expectancy (−1/ln p); it is positive only for 11/3 < T < 40 °C, outside which
 * p = 0 (decision: no survival, not NaN). Maximum p = 0.9039 at T = 21.83 °C.
 * Survival through sporogony p^n uses n from Detinova (1962) [detinova1962]; p^n = 0 at or below Detinova Tmin.
 * Valid range: any finite T; NaN in → NaN out.
 */
import { sporogonyDurationDetinova1962Days, type SporogonyConstants } from './sporogony-detinova-1962.ts';

export const MARTENS_LOWER_LIMIT_C = 11 / 3;
export const MARTENS_UPPER_LIMIT_C = 40;

/** Daily survival probability p(T), 0..1. */
export function dailySurvivalMartens1997(tC: number): number {
  if (Number.isNaN(tC)) return NaN;
  if (!(tC > MARTENS_LOWER_LIMIT_C && tC < MARTENS_UPPER_LIMIT_C)) return 0;
  return Math.exp(-1 / (-4.4 + 1.31 * tC - 0.03 * tC * tC));
}

/** Probability of surviving the whole sporogony, p(T)^n(T) (Martens p, Detinova n), 0..1. */
export function survivalThroughSporogony(tC: number, k: SporogonyConstants): number {
  if (Number.isNaN(tC)) return NaN;
  const n = sporogonyDurationDetinova1962Days(tC, k);
  return n === Infinity ? 0 : Math.pow(dailySurvivalMartens1997(tC), n);
}

/** Largest p^n over 0..45 °C (grid step 0.01 °C), used to scale p^n to 0..1. */
export function maxSurvivalThroughSporogony(k: SporogonyConstants): { readonly tC: number; readonly value: number } {
  let bestT = NaN;
  let bestValue = -1;
  for (let i = 0; i <= 4500; i++) {
    const v = survivalThroughSporogony(i / 100, k);
    if (v > bestValue) {
      bestValue = v;
      bestT = i / 100;
    }
  }
  return { tC: bestT, value: bestValue };
}

/** p^n divided by its maximum over temperature: a relative 0..1 temperature suitability (our scaling, see DECISIONS.md). */
export function relativeSurvivalThroughSporogony(tC: number, k: SporogonyConstants, maxValue: number): number {
  return survivalThroughSporogony(tC, k) / maxValue;
}
