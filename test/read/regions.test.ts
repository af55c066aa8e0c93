/** Region cell selection and weights. Region shapes are the sample world's (common brief). */
import { describe, expect, it } from 'vitest';
import type { RegionConfig, RegionShape } from '../../src/config/types.ts';
import { InputError } from '../../src/core/errors.ts';
import type { LatLonGrid } from '../../src/read/coordinates.ts';
import { planBand } from '../../src/read/regions-band.ts';
import { cellAreaFactors, pointInRing, selectRegionCells } from '../../src/read/regions.ts';
import { sampleRegions } from '../render/fixtures/sample-config.ts';
import { axis } from './fake-forecast.ts';

const grid = (lat: number[], lon: number[], bounds?: { lat: number[]; lon: number[] }): LatLonGrid => ({
  latName: 'lat',
  lonName: 'lon',
  lat: Float64Array.from(lat),
  lon: Float64Array.from(lon),
  latBounds: bounds ? Float64Array.from(bounds.lat) : null,
  lonBounds: bounds ? Float64Array.from(bounds.lon) : null,
});
const region = (id: string, shape: RegionShape): RegionConfig => ({
  id,
  name: id,
  shape,
  utcOffsetHours: 1,
  teams: [],
  cellRule: 'centre',
});
/** The Tulva Delta polygon of the sample world (the render fixtures' regions, so the two cannot drift apart). */
const TULVA: RegionShape = sampleRegions.find((r) => r.id === 'tulva-delta')!.shape;

function lonLats(g: LatLonGrid, r: RegionConfig): string[] {
  const c = selectRegionCells(g, r, 'f.nc');
  return Array.from(c.latIndex, (y, k) => `${g.lon[c.lonIndex[k]]},${g.lat[y]}`).sort();
}

describe('pointInRing (even-odd rule, edges inside)', () => {
  it.each([
    [1, -12, true],
    [2, -10.5, true],
    [3.5, -12, true],
    [0.5, -11, true],
    [2, -13.5, true],
    [3, -10.5, false],
    [0.4, -12, false],
    [2, -10.4, false],
    [3.6, -12, false],
  ])('tulva-delta ring: (%f, %f) → %s (hand-checked against the ring drawn on paper, no published source)', (lon, lat, inside) => {
    expect(pointInRing(lon, lat, TULVA.kind === 'polygon' ? TULVA.ring : [])).toBe(inside);
  });
});

describe('selectRegionCells', () => {
  const g360 = grid(axis(-15, 0.5, 25), axis(0, 0.5, 720));
  const g180 = grid(axis(-3, -0.5, 25), axis(-180, 0.5, 720));

  it('box crossing 0° selects the same cells on 0..360 and -180..180 grids and on descending latitude', () => {
    const r = region('marrow-highlands', { kind: 'box', south: -9, north: -6.5, west: -1.5, east: 1.5 });
    const a = lonLats(g360, r)
      .map((s) => s.split(',').map(Number))
      .map(([lo, la]) => `${lo > 180 ? lo - 360 : lo},${la}`)
      .sort();
    const b = lonLats(g180, r);
    expect(a).toEqual(b);
    expect(a.length).toBe(7 * 6);
  });

  it('box crossing 180° (west > east) and a box written in 0..360 numbers on a -180..180 grid', () => {
    const across = lonLats(g180, region('x', { kind: 'box', south: -5, north: -5, west: 179, east: -179 }));
    expect(across).toEqual(['-179,-5', '-179.5,-5', '-180,-5', '179,-5', '179.5,-5'].sort());
    const in360 = lonLats(g180, region('y', { kind: 'box', south: -5, north: -5, west: 359, east: 1 }));
    expect(in360).toEqual(['-0.5,-5', '-1,-5', '0,-5', '0.5,-5', '1,-5'].sort());
  });

  it('polygon on a 0..360 grid is compared in its own longitude frame', () => {
    const cells = lonLats(g360, region('tulva-delta', TULVA));
    expect(cells).toContain('2,-10.5');
    expect(cells).toContain('3.5,-12');
    expect(cells).not.toContain('3,-10.5');
    const across0 = lonLats(
      g360,
      region('p', {
        kind: 'polygon',
        ring: [
          [-0.5, -9],
          [0.5, -9],
          [0.5, -9],
          [-0.5, -9],
        ],
      }),
    );
    expect(across0).toEqual(['0,-9', '0.5,-9', '359.5,-9'].sort());
  });

  it('region with no cell → InputError naming region, file and grid extent', () => {
    const r = region('far-away', { kind: 'box', south: 40, north: 45, west: 10, east: 12 });
    expect(() => selectRegionCells(g360, r, 'fc_20261123.nc')).toThrow(InputError);
    expect(() => selectRegionCells(g360, r, 'fc_20261123.nc')).toThrow(
      "fc_20261123.nc: region 'far-away' (box 40..45, 10..12) has no grid cell in fc_20261123.nc (grid lat -15..-3, lon 0..359.5) — check the region shape or the source, or use cell-rule: overlap (a region smaller than a cell may hold no centre)",
    );
  });
});

describe('cell area weights', () => {
  it('without bounds: derived like CDO, proportional to cos(latitude) on an even grid (identity sin(φ+h)-sin(φ-h) = 2 cos φ sin h)', () => {
    const { latFactor } = cellAreaFactors(grid([-15, -9, -3], [0, 1]));
    const rad = Math.PI / 180;
    expect(latFactor[0] / latFactor[2]).toBeCloseTo(Math.cos(15 * rad) / Math.cos(3 * rad), 12);
  });

  it('with lat_bnds/lon_bnds: (sin φ2 − sin φ1) × Δλ from the bounds', () => {
    const { latFactor, lonWidth } = cellAreaFactors(grid([-10, 0], [0, 1], { lat: [-20, -5, -5, 5], lon: [-0.5, 0.5, 0.5, 2.5] }));
    const rad = Math.PI / 180;
    expect(latFactor[0]).toBeCloseTo(Math.sin(-5 * rad) - Math.sin(-20 * rad), 14);
    expect(Array.from(lonWidth)).toEqual([1, 2]);
  });
});

describe('planBand', () => {
  it('reads the smallest circular column range; only used cells are kept, regions index them', () => {
    const g = grid([-2, -1, 0], axis(0, 90, 4));
    const a = selectRegionCells(g, region('a', { kind: 'box', south: -1, north: -1, west: -90, east: 0 }), 'f.nc');
    const b = selectRegionCells(g, region('b', { kind: 'box', south: 0, north: 0, west: 0, east: 0 }), 'f.nc');
    const { band, regions } = planBand([a, b], 3, 4);
    expect(band).toEqual({ lat0: 1, nLat: 2, lon0: 3, nLon: 2, gridLon: 4, used: Int32Array.of(0, 1, 3) });
    expect(Array.from(regions[0].cells).sort()).toEqual([0, 1]);
    expect(Array.from(regions[1].cells)).toEqual([2]);
  });
});
