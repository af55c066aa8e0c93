/** The feels-like kinds (heat-index, humidex, apparent-temperature, wbgt-simplified) on feelsLikeSeries. */
import type { Quantity } from '../types.ts';
import { defineIndicator, paramsSchema, type IndicatorDefinition } from './definition.ts';
import { feelsLikeSeries, type FeelsLikeKind } from './feels-like-series.ts';
import { countOutOfRange } from './series-checks.ts';

export type FeelsLikeParams = { readonly basis?: 'tmax' | 'tmean' };

const PARAMS = paramsSchema({
  basis: { enum: ['tmax', 'tmean'], default: 'tmax', description: "Basis temperature: the day's maximum or mean." },
});

export function feelsLikeKind<K extends FeelsLikeKind>(
  kind: K,
  needs: readonly (readonly Quantity[])[],
  describe: IndicatorDefinition['describe'],
): IndicatorDefinition<K, FeelsLikeParams> {
  return defineIndicator<K, FeelsLikeParams>({
    kind,
    units: 'degC',
    needs,
    params: PARAMS,
    describe,
    compute(ind, inputs) {
      const r = feelsLikeSeries(kind, inputs, ind.id, ind.params.basis);
      return { template: r.template, data: r.data, outOfRange: countOutOfRange(r.data, r.raw), notes: r.notes, beyondTable: r.beyondTable };
    },
  });
}
