/** Indicator kind heat-index: NWS Heat Index of the basis temperature and the day's humidity. */
import { feelsLikeKind } from '../feels-like-kind.ts';

export const definition = feelsLikeKind('heat-index', [['tmax'], ['dewpoint', 'rh', 'specific-humidity']], {
  name: 'Heat Index (NWS)',
  description: 'Rothfusz regression with the NWS/WPC low- and high-humidity adjustments and the simple formula below 80 °F.',
  references: ['rothfusz1990', 'nwsWpcHeatIndex'],
});
