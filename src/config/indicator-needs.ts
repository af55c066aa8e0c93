/**
 * What each indicator kind needs from a source, and which threshold units fit it. Keep in step with
 * src/indicators (the formulas): a kind listed here must be computable from these quantities.
 */
import type { Quantity } from '../types.ts';
import type { IndicatorKind } from './types.ts';

/** Each inner list is "any one of these quantities". */
export const QUANTITIES_NEEDED: Readonly<Record<IndicatorKind, readonly (readonly Quantity[])[]>> = {
  'tmax-mean': [['tmax']],
  'tmin-mean': [['tmin']],
  'tmean-mean': [['tmean', 'tmax'], ['tmean', 'tmin']],
  'heat-index': [['tmax'], ['dewpoint', 'rh']],
  humidex: [['tmax'], ['dewpoint', 'rh']],
  'apparent-temperature': [['tmax'], ['dewpoint', 'rh'], ['wind']],
  'wbgt-simplified': [['tmax'], ['dewpoint', 'rh']],
  'excess-heat-factor': [['tmax'], ['tmin']],
  'hot-days-run': [['tmax']],
  'heat-load': [['tmax']],
  'malaria-suitability': [['tmean', 'tmax'], ['tmean', 'tmin'], ['precip']],
};

interface UnitFamily {
  /** Canonical units the loader converts thresholds to. */
  readonly canonical: string;
  /** Accepted spellings → function to the canonical value. */
  readonly accepted: Readonly<Record<string, (v: number) => number>>;
}

const same = (v: number) => v;
const TEMPERATURE: UnitFamily = {
  canonical: 'degC',
  accepted: { degC: same, K: (v) => v - 273.15, degF: (v) => (v - 32) / 1.8 },
};
/** EHF is a product of two temperature differences: K^2 and degC^2 have the same magnitude. */
const TEMPERATURE_SQUARED: UnitFamily = { canonical: 'degC2', accepted: { degC2: same, 'degC^2': same, K2: same, 'K^2': same } };
const DAYS: UnitFamily = { canonical: 'days', accepted: { days: same, d: same } };
const DEGREE_DAYS: UnitFamily = { canonical: 'degC day', accepted: { 'degC day': same, 'K day': same } };
const INDEX: UnitFamily = { canonical: '1', accepted: { '1': same } };

export const THRESHOLD_UNITS: Readonly<Record<IndicatorKind, UnitFamily>> = {
  'tmax-mean': TEMPERATURE,
  'tmin-mean': TEMPERATURE,
  'tmean-mean': TEMPERATURE,
  'heat-index': TEMPERATURE,
  humidex: TEMPERATURE,
  'apparent-temperature': TEMPERATURE,
  'wbgt-simplified': TEMPERATURE,
  'excess-heat-factor': TEMPERATURE_SQUARED,
  'hot-days-run': DAYS,
  'heat-load': DEGREE_DAYS,
  'malaria-suitability': INDEX,
};

export function isIndicatorKind(v: unknown): v is IndicatorKind {
  return typeof v === 'string' && Object.hasOwn(QUANTITIES_NEEDED, v);
}
