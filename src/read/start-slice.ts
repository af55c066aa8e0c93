/**
 * One start of a file holding several forecast starts along a reference-time dimension (CF 1.11 §4.4
 * `forecast_reference_time` as a coordinate of a dimension: cfgrib's `(number, time, step, lat, lon)` with `time` =
 * the start, or `(init, member, lead, lat, lon)`; common practice of hindcast portals, no source). The wrapper
 * shows that dimension with size 1 and reads index K of it, so the per-start extraction runs unchanged: the
 * reference variable holds one time, and every data variable is the start's own slice.
 */
import { InputError } from '../core/errors.ts';
import type { Dataset, DimensionInfo, VariableInfo } from './dataset.ts';
import { referenceVariable } from './time-axis.ts';

/** The reference-time dimension of a file of several starts, and how many starts it holds; null for one start. */
export function startsDimension(ds: Dataset): DimensionInfo | null {
  const ref = referenceVariable(ds);
  const name = ref?.dimensions.length === 1 ? ref.dimensions[0] : undefined;
  const dim = ds.dimensions.find((d) => d.name === name);
  return dim && dim.size > 1 ? dim : null;
}

/** `ds` seen as its start `index` alone (see the module comment); with `variable`, that variable must have the starts dimension. */
export function oneStart(ds: Dataset, index: number, variable?: string): Dataset {
  const dim = startsDimension(ds);
  if (!dim)
    throw new InputError(
      'hindcast-start-index',
      ds.path,
      `start ${index} was listed in this file, but it no longer holds several forecast reference times`,
      'the file changed after it was listed: run again once the download has finished',
    );
  if (!Number.isInteger(index) || index < 0 || index >= dim.size)
    throw new InputError(
      'hindcast-start-index',
      ds.path,
      `start ${index} was listed, but '${dim.name}' holds only ${dim.size} starts`,
      'the file changed after it was listed (a truncated or replaced download): run again once the download has finished',
    );
  const slim = (v: VariableInfo): VariableInfo => {
    const axis = v.dimensions.indexOf(dim.name);
    return axis < 0 ? v : { ...v, shape: v.shape.map((n, k) => (k === axis ? 1 : n)) };
  };
  const variables = ds.variables.map(slim);
  const byName = new Map(variables.map((v) => [v.name, v]));
  const shift = (name: string, start: readonly number[]): number[] => {
    const axis = ds.variable(name)?.dimensions.indexOf(dim.name) ?? -1;
    return start.map((s, k) => (k === axis ? s + index : s));
  };
  const readRawAt = ds.readRawAt?.bind(ds);
  const info = variable === undefined ? undefined : ds.variable(variable);
  if (info) requireStartsDimension(ds, info);
  return {
    path: ds.path,
    format: ds.format,
    dimensions: ds.dimensions.map((d) => (d.name === dim.name ? { ...d, size: 1 } : d)),
    attributes: ds.attributes,
    variables,
    variable: (name) => byName.get(name),
    readRaw: (name, start, count) => ds.readRaw(name, shift(name, start), count),
    ...(readRawAt ? { readRawAt: (name, start, count, positions) => readRawAt(name, shift(name, start), count, positions) } : {}),
    ...(ds.readAhead !== undefined ? { readAhead: ds.readAhead } : {}),
    close: () => ds.close(),
  };
}

/** A data variable of a file of several starts (seen through `oneStart`) that lacks their dimension would give every start the same values. */
export function requireStartsDimension(ds: Dataset, variable: VariableInfo): void {
  const dimension = referenceVariable(ds)?.dimensions[0];
  if (dimension === undefined || variable.dimensions.includes(dimension)) return;
  throw new InputError(
    'hindcast-starts-variable',
    ds.path,
    `variable '${variable.name}' (${variable.dimensions.join(', ')}) lacks the dimension '${dimension}' of the file's forecast starts`,
    `give '${variable.name}' one slice per start along '${dimension}' (e.g. rewrite the file with ncecat -u ${dimension} over the per-start files), or provide one file per start named with {date}`,
  );
}
