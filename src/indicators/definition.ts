/**
 * What an indicator kind declares about itself, in one place: its kind name, result units, the quantities it needs,
 * a JSON Schema of its YAML `params:`, the computation, and the words used in the docs. Each kind is one module in
 * `src/indicators/kinds/`; the registry (`registry.ts`) lists them, and the compute dispatch, `forelight check`, the
 * configuration schema and the README table are derived from it.
 */
import type { IsoDate, ModelDays, Quantity, RegionSeries } from '../types.ts';
import type { ReferenceKey } from './references.ts';

export type AntecedentQuantity = 'tmax' | 'tmin' | 'tmean';

/** Climatological values for one region (from hindcasts or observations, see the report to the pipeline). */
export interface IndicatorClimatology {
  /** T95: 95th percentile (numpy linear) of daily mean temperature DMT over the reference period, °C. */
  readonly dmtP95C?: number;
  /** EHF85: 85th percentile of the positive EHF values of the reference period, °C². */
  readonly ehf85?: number;
  /** Fixed daily threshold for hot-days-run / heat-load, °C. */
  readonly thresholdC?: number;
  /** Day-of-year threshold for hot-days-run / heat-load, °C (see dayOfYearPercentileThreshold); wins over thresholdC. */
  readonly dayOfYearThresholdC?: (date: IsoDate) => number;
}

export interface IndicatorContext {
  readonly climatology?: IndicatorClimatology;
  /** Analysed DMT of the (up to) 30 days before lead day 1, oldest first, °C. */
  readonly antecedentDmtC?: Float64Array;
  /** Analysed region values of the days right before lead day 1, oldest first, °C (same for all members). */
  readonly antecedent?: Readonly<Partial<Record<AntecedentQuantity, Float64Array>>>;
}

/** The part of an indicator's configuration its computation uses; `params` keys are camelCase. */
export interface IndicatorSpec<K extends string = string, P = Readonly<Record<string, unknown>>> {
  readonly id: string;
  readonly kind: K;
  /** Running-mean window in days where the kind uses one. */
  readonly windowDays: number;
  readonly params: P;
}

/** A kind's computed values; the registry adds region, indicator id, units and the missing count. */
export interface KindOutput {
  /** The input series whose region, members and days the result shares. */
  readonly template: RegionSeries;
  /** Per member and day (member-major), NaN where unknown. */
  readonly data: Float64Array;
  /** Values whose inputs were outside the formula's valid range (NaN in `data`). */
  readonly outOfRange: number;
  /** Plain-language notes on partial or assumed inputs (for the ledger and bulletins). */
  readonly notes: readonly string[];
  /** 1 where a value lies beyond the formula's published table and was capped there (heat index), member-major. */
  readonly beyondTable?: Uint8Array;
  /** Days of the result when they differ from the template's (monthly indices). */
  readonly days?: readonly IsoDate[];
  /** The model dates of `days` when they differ from the template's and the inputs are in a model calendar. */
  readonly modelCalendar?: ModelDays;
}

/** A JSON Schema (draft 2020-12) object, as written into config/forelight.schema.json. */
export type JsonSchema = { readonly [keyword: string]: unknown };

export interface IndicatorDefinition<K extends string = string, P = Readonly<Record<string, unknown>>> {
  /** The `kind:` operators write in the YAML. */
  readonly kind: K;
  /** Canonical units of the result (thresholds are converted to them), e.g. degC, degC2, days, 1. */
  readonly units: string;
  /** Quantities a source must map; each inner list is "any one of these". */
  readonly needs: readonly (readonly Quantity[])[];
  /** JSON Schema of the YAML `params:` mapping (kebab-case keys), with `default` and `description` per key. */
  readonly params: JsonSchema;
  /** Rules between parameters that JSON Schema cannot state; throws ForelightError('indicators', 'bad-param'). */
  readonly checkParams?: (ind: IndicatorSpec<K, P>) => void;
  readonly compute: (ind: IndicatorSpec<K, P>, inputs: ReadonlyMap<Quantity, RegionSeries>, context: IndicatorContext) => KindOutput;
  /** For the docs: what it is and its sources (keys of references.ts; none = common practice, no source). */
  readonly describe: { readonly name: string; readonly description: string; readonly references: readonly ReferenceKey[] };
}

/** Identity helper that keeps the literal kind and the params type of a definition. */
export function defineIndicator<K extends string, P>(definition: IndicatorDefinition<K, P>): IndicatorDefinition<K, P> {
  return definition;
}

/** JSON Schema of a `params:` mapping with these keys (none given = the kind takes no parameters). */
export function paramsSchema(properties: Readonly<Record<string, JsonSchema>> = {}): JsonSchema {
  return { type: 'object', additionalProperties: false, properties };
}
