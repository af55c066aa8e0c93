/** Indicator kind apparent-temperature: Steadman apparent temperature (BoM form, shade, with wind). */
import { feelsLikeKind } from '../feels-like-kind.ts';

export const definition = feelsLikeKind('apparent-temperature', [['tmax'], ['dewpoint', 'rh', 'specific-humidity'], ['wind']], {
  name: 'Apparent temperature (Steadman, BoM form)',
  description: 'AT = Ta + 0.33 e − 0.70 ws − 4.00 in the shade; needs 10 m wind (calm is never assumed).',
  references: ['steadman1994', 'bomThermalComfort'],
});
