/**
 * Reading one member's band hyperslab of a data variable and keeping only the cells regions use, as
 * `[time][usedCell]` (the layout daily.ts and extract-reduce.ts work on).
 */
import type { Dataset } from './dataset.ts';
import { decodeCf } from './cf-decode.ts';
import type { VariableLayout } from './coordinates.ts';
import type { GridBand } from './regions-band.ts';

/**
 * One member's (or the only member's) decoded values of the band's used cells over `steps` steps from `firstStep`,
 * as `[time][usedCell]` (a fresh array per call).
 * @param member index along the member axis (ignored when the variable has none)
 * @param steps number of time steps (1 when the variable has no time axis)
 */
export type BandCellReader = (member: number, firstStep: number, steps: number) => Promise<Float64Array>;

/**
 * A reader of `band.used` for one variable: one hyperslab per call. A band that wraps past the last longitude is
 * read as whole rows (the classic reader would fetch the gap between two pieces anyway). The cells' offsets in the
 * hyperslab are sorted once here, so each call asks the dataset for ascending positions (decoded in one forward pass)
 * and scatters them back to `band.used` order. Only the used cells are CF-decoded.
 */
export function bandCellReader(ds: Dataset, layout: VariableLayout, band: GridBand): BandCellReader {
  const { info } = layout;
  const rank = info.dimensions.length;
  const wraps = band.lon0 + band.nLon > band.gridLon;
  const start = new Array<number>(rank).fill(0);
  const count = new Array<number>(rank).fill(1);
  start[layout.latAxis] = band.lat0;
  count[layout.latAxis] = band.nLat;
  start[layout.lonAxis] = wraps ? 0 : band.lon0;
  count[layout.lonAxis] = wraps ? band.gridLon : band.nLon;
  const cells = band.used.length;
  const firstLon = wraps ? band.lon0 : 0;
  /** C-order strides of the hyperslab when it spans `steps` time steps (they depend on it when time is inner to lat/lon). */
  const stridesFor = (steps: number): number[] => {
    const n = [...count];
    if (layout.timeAxis >= 0) n[layout.timeAxis] = steps;
    const strides = new Array<number>(rank).fill(1);
    for (let k = rank - 2; k >= 0; k--) strides[k] = strides[k + 1] * n[k + 1];
    return strides;
  };
  const offsetsWith = (strides: readonly number[]): number[] =>
    Array.from(band.used, (u) => {
      const r = Math.floor(u / band.nLon);
      const c = (u - r * band.nLon + firstLon) % count[layout.lonAxis];
      return r * strides[layout.latAxis] + c * strides[layout.lonAxis];
    });
  const offsets = offsetsWith(stridesFor(1));
  /** order[j] = the used cell at the j-th smallest offset (the same for any number of steps: axis order decides it). */
  const order = Int32Array.from(offsets.keys()).sort((a, b) => offsets[a] - offsets[b]);
  /** Positions of the used cells over `steps` steps, [time][cell in `order`]: the same for every member, so built once per length. */
  const positionsByLength = new Map<number, Int32Array>();
  const positionsFor = (steps: number): Int32Array => {
    let positions = positionsByLength.get(steps);
    if (!positions) {
      const strides = stridesFor(steps);
      const sT = layout.timeAxis >= 0 ? strides[layout.timeAxis] : 0;
      const stepOffsets = offsetsWith(strides);
      const sortedOffsets = Int32Array.from(order, (k) => stepOffsets[k]);
      positions = new Int32Array(steps * cells);
      for (let t = 0; t < steps; t++) for (let j = 0; j < cells; j++) positions[t * cells + j] = t * sT + sortedOffsets[j];
      positionsByLength.set(steps, positions);
    }
    return positions;
  };

  return async (member, firstStep, steps) => {
    const at = [...start];
    const n = [...count];
    if (layout.memberAxis >= 0) at[layout.memberAxis] = member;
    if (layout.timeAxis >= 0) {
      at[layout.timeAxis] = firstStep;
      n[layout.timeAxis] = steps;
    }
    const positions = positionsFor(steps);
    let raw: Float64Array;
    if (ds.readRawAt) {
      raw = await ds.readRawAt(info.name, at, n, positions);
    } else {
      const slab = await ds.readRaw(info.name, at, n);
      raw = Float64Array.from(positions, (p) => slab[p]);
    }
    const out = new Float64Array(raw.length);
    for (let t = 0; t < steps; t++) {
      const row = t * cells;
      for (let j = 0; j < cells; j++) out[row + order[j]] = raw[row + j];
    }
    return decodeCf(info, out).values;
  };
}
