/**
 * Thresholds that cannot tell a forecast from a normal year. A threshold drawn from a climate (a percentile of the
 * hindcasts, or an absolute value quantile-mapped through observations) is meant to mark an event of some
 * frequency. On a saturated index (malaria suitability is 1 over a wide band of warm, wet months) the climate's
 * values tie at the index's bound, and the threshold lands on the tie:
 * - unreachable: no hindcast value exceeds it (the 90th percentile of values all equal to 1 is 1, and nothing is
 *   greater than 1; or 0.75, below every observed month, maps to the model's minimum, which is 1 when every
 *   hindcast value is 1), although it stands for an event that happens (1 − q/100, or the observed frequency); a
 *   forecast with no member above it would read "no risk" while the event is the normal state;
 * - certain: every hindcast value or every observed year exceeds it, and so does every forecast member; "100 %"
 *   then says nothing a normal year does not.
 * Either way the lead is held (its probability is not used to set a stage) and said. Forelight's own rule, no
 * source: a probability equal to the climate's own certainty carries no forecast information.
 */
import type { LeadWindow } from '../types.ts';
import { leadLabel } from './lead-tiers.ts';

export interface ThresholdUse {
  readonly lead: LeadWindow;
  readonly threshold: number;
  readonly units: string;
  /** Fraction of the hindcast values at this lead above the threshold. */
  readonly modelFrequency: number;
  /** Normal-year frequency printed beside the probability (observed where observations cover the lead). */
  readonly normalYearRate: number;
  /** Frequency the threshold stands for: 1 − q/100 for a percentile, the observed frequency for a mapped value. */
  readonly intendedFrequency: number;
  /** The forecast's probability of exceeding it. */
  readonly probability: number;
}

const pct = (x: number): string => `${Math.round(x * 1000) / 10} %`;

/** Why this lead's threshold cannot tell the forecast from a normal year, or null when it can (see the module comment). */
export function degenerateThreshold(u: ThresholdUse): string | null {
  const where = `${leadLabel(u.lead)}: threshold ${Math.round(u.threshold * 1000) / 1000} ${u.units}`;
  if (u.probability === 0 && u.modelFrequency === 0 && u.intendedFrequency > 0)
    return (
      `${where} is exceeded by no hindcast value, though it stands for an event of frequency ${pct(u.intendedFrequency)} ` +
      `(normal year ${pct(u.normalYearRate)}); no forecast can exceed it, so 0 % would be a false all-clear — lead held`
    );
  if (u.probability === 1 && (u.modelFrequency === 1 || u.normalYearRate === 1))
    return (
      `${where} is exceeded by ${pct(u.modelFrequency)} of the hindcast values and in ${pct(u.normalYearRate)} of normal years, ` +
      `and by every forecast member; 100 % cannot tell this forecast from a normal year — lead held`
    );
  return null;
}
