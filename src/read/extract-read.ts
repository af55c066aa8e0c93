/**
 * Reading one member's band hyperslab of a data variable and keeping only the cells regions use, as
 * `[time][usedCell]` (the layout daily.ts and extract-reduce.ts work on).
 */
import type { Dataset } from './dataset.ts';
import { decodeCf } from './cf-decode.ts';
import type { VariableLayout } from './coordinates.ts';
import type { GridBand } from './regions-band.ts';

/**
 * One member's (or the only member's) decoded values of the band's used cells (`band.used`) over steps
 * `firstStep`…`firstStep + steps - 1`, as `[time][usedCell]`. One hyperslab per call: a band that wraps past
 * the last longitude is read as whole rows (the classic reader would fetch the gap between two pieces anyway).
 * Only the used cells are CF-decoded.
 * @param member index along the member axis (ignored when the variable has none)
 * @param steps number of time steps (1 when the variable has no time axis)
 */
export async function readBandCells(ds: Dataset, layout: VariableLayout, band: GridBand, member: number, firstStep: number, steps: number): Promise<Float64Array> {
  const { info } = layout;
  const rank = info.dimensions.length;
  const wraps = band.lon0 + band.nLon > band.gridLon;
  const start = new Array<number>(rank).fill(0);
  const count = new Array<number>(rank).fill(1);
  if (layout.memberAxis >= 0) start[layout.memberAxis] = member;
  if (layout.timeAxis >= 0) {
    start[layout.timeAxis] = firstStep;
    count[layout.timeAxis] = steps;
  }
  start[layout.latAxis] = band.lat0;
  count[layout.latAxis] = band.nLat;
  start[layout.lonAxis] = wraps ? 0 : band.lon0;
  count[layout.lonAxis] = wraps ? band.gridLon : band.nLon;
  const strides = new Array<number>(rank).fill(1);
  for (let k = rank - 2; k >= 0; k--) strides[k] = strides[k + 1] * count[k + 1];
  const sT = layout.timeAxis >= 0 ? strides[layout.timeAxis] : 0;
  const used = band.used;
  const offsets = new Int32Array(used.length);
  const firstLon = wraps ? band.lon0 : 0;
  for (let k = 0; k < used.length; k++) {
    const r = Math.floor(used[k] / band.nLon);
    const c = (used[k] - r * band.nLon + firstLon) % count[layout.lonAxis];
    offsets[k] = r * strides[layout.latAxis] + c * strides[layout.lonAxis];
  }
  const positions = new Int32Array(steps * used.length);
  for (let t = 0; t < steps; t++) for (let k = 0; k < used.length; k++) positions[t * used.length + k] = t * sT + offsets[k];
  let out: Float64Array;
  if (ds.readRawAt) {
    out = await ds.readRawAt(info.name, start, count, positions);
  } else {
    const slab = await ds.readRaw(info.name, start, count);
    out = new Float64Array(positions.length);
    for (let i = 0; i < positions.length; i++) out[i] = slab[positions[i]];
  }
  return decodeCf(info, out).values;
}
