/** Indicator kind tmin-mean: running mean of the daily minimum temperature. */
import { runningMeanKind } from '../running-mean-kind.ts';

export const definition = runningMeanKind('tmin-mean', 'tmin', [['tmin']], {
  name: 'Running mean of daily minimum temperature',
  description: 'Mean of Tmin over the last window-days days (warm nights).',
  references: [],
});
