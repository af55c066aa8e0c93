/** Indicator kind wbgt-simplified: the Bureau of Meteorology's simplified WBGT. */
import { feelsLikeKind } from '../feels-like-kind.ts';

export const definition = feelsLikeKind('wbgt-simplified', [['tmax'], ['dewpoint', 'rh', 'specific-humidity']], {
  name: 'Simplified WBGT (BoM)',
  description: 'WBGT ≈ 0.567 Ta + 0.393 e + 3.94, assuming fairly strong sunshine and light wind (an estimate, not a measured WBGT).',
  references: ['bomThermalComfort', 'acsm1984'],
});
