/**
 * Which threshold units fit an indicator: the spellings accepted for each canonical result unit that an indicator
 * kind declares (src/indicators/kinds/), and the conversion to it.
 */
import { indicatorDefinition, type IndicatorKind } from '../indicators/registry.ts';

export interface UnitFamily {
  /** Canonical units the loader converts thresholds to. */
  readonly canonical: string;
  /** Accepted spellings → function to the canonical value. */
  readonly accepted: Readonly<Record<string, (v: number) => number>>;
}

const same = (v: number) => v;

/** Canonical result units → accepted threshold spellings. A kind's `units` must be one of these keys. */
export const UNIT_FAMILIES: Readonly<Record<string, UnitFamily>> = {
  degC: { canonical: 'degC', accepted: { degC: same, K: (v) => v - 273.15, degF: (v) => (v - 32) / 1.8 } },
  /** EHF is a product of two temperature differences: K^2 and degC^2 have the same magnitude. */
  degC2: { canonical: 'degC2', accepted: { degC2: same, 'degC^2': same, K2: same, 'K^2': same } },
  days: { canonical: 'days', accepted: { days: same, d: same } },
  'degC day': { canonical: 'degC day', accepted: { 'degC day': same, 'K day': same } },
  '1': { canonical: '1', accepted: { '1': same } },
  /** A share of the region's area or people (region-value: share-above). */
  '%': { canonical: '%', accepted: { '%': same, percent: same } },
};

/**
 * The threshold units of an indicator kind (the registry test checks every kind's units has a family); `share`: the
 * indicator's region value is a share above a level (region-value: share-above), in %.
 */
export function thresholdUnits(kind: IndicatorKind, share = false): UnitFamily {
  return UNIT_FAMILIES[share ? '%' : indicatorDefinition(kind).units];
}
