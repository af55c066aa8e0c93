/** Indicator kind humidex: Canadian humidex from the basis temperature and the dewpoint. */
import { feelsLikeKind } from '../feels-like-kind.ts';

export const definition = feelsLikeKind('humidex', [['tmax'], ['dewpoint', 'rh', 'specific-humidity']], {
  name: 'Humidex',
  description: 'H = T + 0.5555 (e − 10), vapour pressure e from the dewpoint.',
  references: ['mastertonRichardson1979'],
});
