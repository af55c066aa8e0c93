/** Indicator kind tmax-mean: running mean of the daily maximum temperature. */
import { runningMeanKind } from '../running-mean-kind.ts';

export const definition = runningMeanKind('tmax-mean', 'tmax', [['tmax']], {
  name: 'Running mean of daily maximum temperature',
  description: 'Mean of Tmax over the last window-days days (analysed days before lead day 1 fill the first windows).',
  references: [],
});
