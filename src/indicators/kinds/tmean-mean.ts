/** Indicator kind tmean-mean: running mean of the daily mean temperature. */
import { runningMeanKind } from '../running-mean-kind.ts';

export const definition = runningMeanKind(
  'tmean-mean',
  'tmean',
  [
    ['tmean', 'tmax'],
    ['tmean', 'tmin'],
  ],
  {
    name: 'Running mean of daily mean temperature',
    description: 'Mean of the daily mean temperature (tmean, else (Tmax + Tmin)/2, said in a note) over window-days days.',
    references: [],
  },
);
