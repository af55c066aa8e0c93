/**
 * Reading decoded values: a whole small variable, or one member's band hyperslab of a data variable
 * rearranged to `[time][row][column]` (the layout daily.ts and extract-reduce.ts work on).
 */
import type { Dataset, VariableInfo } from './dataset.ts';
import { decodeCf } from './cf-decode.ts';
import type { VariableLayout } from './coordinates.ts';
import type { GridBand } from './regions-band.ts';

/** CF-decoded values (NaN where missing) of the hyperslab `start`/`count` of `info`. */
export async function readDecoded(ds: Dataset, info: VariableInfo, start: readonly number[], count: readonly number[]): Promise<Float64Array> {
  const raw = await ds.readRaw(info.name, start, count);
  return decodeCf(info, raw).values;
}

/**
 * One member's (or the only member's) values over all time steps on `band`, as `[time][row][column]`.
 * A band that wraps past the last longitude is read as two hyperslabs.
 * @param member index along the member axis (ignored when the variable has none)
 * @param steps number of time steps (1 when the variable has no time axis)
 */
export async function readBandSlab(ds: Dataset, layout: VariableLayout, band: GridBand, member: number, steps: number): Promise<Float64Array> {
  const { info } = layout;
  const rank = info.dimensions.length;
  let out: Float64Array | null = null;
  const firstCols = Math.min(band.nLon, band.gridLon - band.lon0);
  const pieces: [number, number, number][] = [[band.lon0, firstCols, 0]];
  if (firstCols < band.nLon) pieces.push([0, band.nLon - firstCols, firstCols]);
  for (const [lonStart, lonCount, colOffset] of pieces) {
    const start = new Array<number>(rank).fill(0);
    const count = new Array<number>(rank).fill(1);
    if (layout.memberAxis >= 0) start[layout.memberAxis] = member;
    if (layout.timeAxis >= 0) count[layout.timeAxis] = steps;
    start[layout.latAxis] = band.lat0;
    count[layout.latAxis] = band.nLat;
    start[layout.lonAxis] = lonStart;
    count[layout.lonAxis] = lonCount;
    const slab = await readDecoded(ds, info, start, count);
    const strides = new Array<number>(rank).fill(1);
    for (let k = rank - 2; k >= 0; k--) strides[k] = strides[k + 1] * count[k + 1];
    const sT = layout.timeAxis >= 0 ? strides[layout.timeAxis] : 0;
    const sR = strides[layout.latAxis];
    const sC = strides[layout.lonAxis];
    if (pieces.length === 1 && sC === 1 && sR === lonCount && (steps === 1 || sT === band.nLat * lonCount)) return slab;
    out ??= new Float64Array(steps * band.nLat * band.nLon);
    for (let t = 0; t < steps; t++) {
      for (let r = 0; r < band.nLat; r++) {
        const dst = (t * band.nLat + r) * band.nLon + colOffset;
        const src = t * sT + r * sR;
        for (let c = 0; c < lonCount; c++) out[dst + c] = slab[src + c * sC];
      }
    }
  }
  return out ?? new Float64Array(0);
}
