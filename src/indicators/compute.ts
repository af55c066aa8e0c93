/**
 * Series-level indicators: what the pipeline calls for one indicator × region. Pure computation.
 * Inputs are the read stage's RegionSeries in canonical units; the result is per member and day. Each kind's
 * computation is its definition in src/indicators/kinds/ (see registry.ts); this adds what every result carries.
 * See DECISIONS.md for the choices made where the sources leave room.
 */
import type { IndicatorSeries, Quantity, RegionSeries } from '../types.ts';
import type { IndicatorContext } from './definition.ts';
import { indicatorDefinition, type AnyIndicatorSpec } from './registry.ts';
import { countNaN } from './series-checks.ts';

// Helpers the pipeline needs around computeIndicator (climatology, monthly view, categories), one entry point.
export { ehfClimatology, type EhfClimatology } from './climatology.ts';
export type { AntecedentQuantity, IndicatorClimatology, IndicatorContext } from './definition.ts';
export { ehfSeverityCategory, ehfSeverityRatio, type EhfSeverity } from './excess-heat-factor-nairn-fawcett-2015.ts';
export {
  monthlySuitability,
  parseMalariaParams,
  suitabilityCategory,
  type MalariaParams,
  type MonthlySuitability,
  type SuitabilityCategory,
} from './malaria-monthly.ts';
export { dayOfYearPercentileThreshold } from './percentile.ts';

/** An IndicatorSeries plus plain-language notes on partial or assumed inputs (for the ledger and bulletins). */
export interface IndicatorResult extends IndicatorSeries {
  readonly notes: readonly string[];
}

/**
 * Computes one indicator for one region, all members, at the daily step, with its kind's definition.
 * Throws ForelightError ('indicators') for a missing quantity, climatology or bad params; InputError/UnitError
 * for impossible input values or non-canonical units (naming region and quantity).
 */
export function computeIndicator(
  ind: AnyIndicatorSpec,
  inputs: ReadonlyMap<Quantity, RegionSeries>,
  context: IndicatorContext = {},
): IndicatorResult {
  const definition = indicatorDefinition(ind.kind);
  const out = definition.compute(ind, inputs, context);
  const { template: t, data } = out;
  return {
    region: t.region,
    indicator: ind.id,
    units: definition.units,
    days: out.days ?? t.days,
    members: t.members,
    data,
    outOfRange: out.outOfRange,
    ...(out.beyondTable ? { beyondTable: out.beyondTable } : {}),
    ...(out.modelCalendar
      ? { modelCalendar: out.modelCalendar }
      : out.days === undefined && t.modelCalendar
        ? { modelCalendar: t.modelCalendar }
        : {}),
    missing: countNaN(data),
    notes: out.notes,
  };
}
