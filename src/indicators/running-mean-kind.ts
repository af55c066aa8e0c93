/** The running-mean kinds (tmax-mean, tmin-mean, tmean-mean): one definition builder, one module per kind. */
import type { Quantity } from '../types.ts';
import { defineIndicator, paramsSchema, type AntecedentQuantity, type IndicatorDefinition } from './definition.ts';
import { meanTemperature, windowDays } from './kind-inputs.ts';
import { requireQuantity } from './series-checks.ts';
import { runningMeanSeries } from './threshold-series.ts';

/** No parameters: `params:` must be absent or empty. */
export type NoParams = { readonly [key: string]: never };

/** Running mean over `window-days` of daily `of` (tmean: the tmean series, else (tmax + tmin)/2), °C. */
export function runningMeanKind<K extends string>(
  kind: K,
  of: AntecedentQuantity,
  needs: readonly (readonly Quantity[])[],
  describe: IndicatorDefinition['describe'],
): IndicatorDefinition<K, NoParams> {
  return defineIndicator<K, NoParams>({
    kind,
    units: 'degC',
    needs,
    params: paramsSchema(),
    describe,
    compute(ind, inputs, context) {
      const notes: string[] = [];
      const t = of === 'tmean' ? meanTemperature(ind, inputs, notes) : requireQuantity(inputs, of, ind.id, 'running mean');
      return { template: t, data: runningMeanSeries(t, windowDays(ind), context.antecedent?.[of]), outOfRange: 0, notes };
    },
  });
}
