/**
 * Builds in-memory forecast files in the layout of forecast-centre GRIB→NetCDF conversions (dimensions
 * `number, step, latitude, longitude`, a scalar `time` with standard_name forecast_reference_time, lead
 * `step` in hours). Values come from `value(member, step, lat, lon)`; NaN is stored as the _FillValue.
 */
import type { AttributeValue } from '../../src/read/dataset.ts';
import { makeFakeDataset, type FakeVariable } from './fake-dataset.ts';

export interface FakeForecastOptions {
  readonly path?: string;
  readonly lat: readonly number[];
  readonly lon: readonly number[];
  readonly stepsHours: readonly number[];
  readonly members?: number;
  /** Hours since 2026-11-23T00Z of the reference time. */
  readonly referenceHours?: number;
  /** Data variables: name → attributes and values (dimensions number, step, latitude, longitude). */
  /** Store data variables as (step, number, latitude, longitude), the layout of many archive conversions. */
  readonly stepOuter?: boolean;
  readonly variables: Record<string, { readonly attributes: Record<string, AttributeValue>; readonly value: ValueFn }>;
}

export type ValueFn = (member: number, step: number, lat: number, lon: number) => number;

export const FILL = -32767;

export function makeFakeForecast(o: FakeForecastOptions) {
  const members = o.members ?? 1;
  const fill = (value: ValueFn): number[] => {
    const data: number[] = [];
    const steps = o.stepsHours.length;
    const [outer, inner] = o.stepOuter ? [steps, members] : [members, steps];
    for (let a = 0; a < outer; a++) {
      for (let b = 0; b < inner; b++) {
        const [m, t] = o.stepOuter ? [b, a] : [a, b];
        for (const la of o.lat)
          for (const lo of o.lon) {
            const v = value(m, t, la, lo);
            data.push(Number.isNaN(v) ? FILL : v);
          }
      }
    }
    return data;
  };
  const variables: Record<string, FakeVariable> = {
    number: {
      dimensions: ['number'],
      attributes: { standard_name: 'realization' },
      type: 'int',
      data: Array.from({ length: members }, (_x, i) => i),
    },
    time: {
      dimensions: [],
      attributes: { standard_name: 'forecast_reference_time', units: 'hours since 2026-11-23 00:00:00' },
      data: [o.referenceHours ?? 0],
    },
    step: { dimensions: ['step'], attributes: { standard_name: 'forecast_period', units: 'hours' }, data: o.stepsHours },
    latitude: { dimensions: ['latitude'], attributes: { units: 'degrees_north' }, data: o.lat },
    longitude: { dimensions: ['longitude'], attributes: { units: 'degrees_east' }, data: o.lon },
  };
  for (const [name, v] of Object.entries(o.variables)) {
    variables[name] = {
      dimensions: o.stepOuter ? ['step', 'number', 'latitude', 'longitude'] : ['number', 'step', 'latitude', 'longitude'],
      attributes: { _FillValue: FILL, ...v.attributes },
      data: fill(v.value),
    };
  }
  return makeFakeDataset({
    path: o.path ?? 'fc_20261123.nc',
    dimensions: { number: members, step: o.stepsHours.length, latitude: o.lat.length, longitude: o.lon.length },
    variables,
  });
}

/** Evenly spaced values from `first` by `step`, `n` of them. */
export function axis(first: number, step: number, n: number): number[] {
  return Array.from({ length: n }, (_x, i) => first + i * step);
}
