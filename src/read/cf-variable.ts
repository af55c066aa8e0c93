/** Reading the small CF coordinate variables of a file: a text attribute, all values decoded, and the `bounds` variable (CF §7.1). */
import { decodeCf } from './cf-decode.ts';
import type { Dataset, VariableInfo } from './dataset.ts';

/** A text attribute, trimmed (undefined when absent or not text). */
export function attr(info: VariableInfo, key: string): string | undefined {
  const v = info.attributes[key];
  return typeof v === 'string' ? v.trim() : undefined;
}

/** All CF-decoded values of a (small, coordinate) variable. */
export async function readWhole(ds: Dataset, info: VariableInfo): Promise<Float64Array> {
  return decodeCf(
    info,
    await ds.readRaw(
      info.name,
      info.shape.map(() => 0),
      info.shape,
    ),
  ).values;
}

export async function readBounds(ds: Dataset, info: VariableInfo, n: number): Promise<Float64Array | null> {
  const name = attr(info, 'bounds');
  const b = name === undefined ? undefined : ds.variable(name);
  if (!b || b.shape.length !== 2 || b.shape[0] !== n || b.shape[1] !== 2) return null;
  return readWhole(ds, b);
}
