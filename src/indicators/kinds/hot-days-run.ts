/** Indicator kind hot-days-run: length of the current run of days above a daily threshold, per member. */
import { defineIndicator, paramsSchema, type AntecedentQuantity } from '../definition.ts';
import { DAILY_THRESHOLD_PARAMS, dayThreshold, temperatureInput, type DailyThresholdParams } from '../kind-inputs.ts';
import { hotDaysRunSeries } from '../threshold-series.ts';

export const definition = defineIndicator<'hot-days-run', DailyThresholdParams>({
  kind: 'hot-days-run',
  units: 'days',
  needs: [['tmax']],
  params: paramsSchema(DAILY_THRESHOLD_PARAMS),
  describe: {
    name: 'Run of hot days',
    description:
      'Consecutive days, up to each day, with the temperature above the daily threshold (analysed days before lead day 1 count).',
    references: [],
  },
  compute(ind, inputs, context) {
    const notes: string[] = [];
    const t = temperatureInput(ind, inputs, 'tmax', notes);
    const data = hotDaysRunSeries(t, dayThreshold(ind, t.region, context), context.antecedent?.[t.quantity as AntecedentQuantity]);
    return { template: t, data, outOfRange: 0, notes };
  },
});
