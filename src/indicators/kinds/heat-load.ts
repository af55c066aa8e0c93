/** Indicator kind heat-load: sum over window-days of the degrees above a daily threshold, per member. */
import { defineIndicator, paramsSchema, type AntecedentQuantity } from '../definition.ts';
import { DAILY_THRESHOLD_PARAMS, dayThreshold, temperatureInput, windowDays, type DailyThresholdParams } from '../kind-inputs.ts';
import { heatLoadSeries } from '../threshold-series.ts';

export const definition = defineIndicator<'heat-load', DailyThresholdParams>({
  kind: 'heat-load',
  units: 'degC day',
  needs: [['tmax']],
  params: paramsSchema(DAILY_THRESHOLD_PARAMS),
  describe: {
    name: 'Heat load (degree days above a threshold)',
    description: 'Sum over the last window-days days of max(0, temperature − daily threshold).',
    references: [],
  },
  compute(ind, inputs, context) {
    const notes: string[] = [];
    const t = temperatureInput(ind, inputs, 'tmax', notes);
    const data = heatLoadSeries(
      t,
      windowDays(ind),
      dayThreshold(ind, t.region, context),
      context.antecedent?.[t.quantity as AntecedentQuantity],
    );
    return { template: t, data, outOfRange: 0, notes };
  },
});
