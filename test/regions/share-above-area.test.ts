/**
 * `region-value: { weights: area, share-above: L }` end to end (read a NetCDF file written by netCDF4-python, keep
 * each cell's series, compute the indicator per cell, share of the region's area above L) against numpy with
 * shapely cell ∩ district areas (region_means_reference.py, exact on the sphere), within 1e-4 percentage points,
 * on the sample districts (a hole, an enclave, an island, a district smaller than a cell).
 * The indicator is tmax-mean over 1 day, i.e. each cell's own daily value.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { regionIndicator } from '../../src/calibrate/region-indicator.ts';
import { featurePolygons } from '../../src/config/boundaries/feature-geometry.ts';
import { regionIdOf } from '../../src/config/boundaries/boundary-sets.ts';
import { readRegions, regionViewId } from '../../src/config/region-views.ts';
import type { IndicatorConfig, RegionConfig } from '../../src/config/types.ts';
import { readFile } from '../../src/pipeline/read-file.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';

const DISTRICTS = join(import.meta.dirname, '../../config/veloria-districts.geojson');
/** Between the districts' coolest and warmest cells on days 0–2 of the reference field (about 21–23 °C there). */
const LEVEL = 22.3;

const features = JSON.parse(readFileSync(DISTRICTS, 'utf8')).features as { properties: { code: string }; geometry: never }[];
const regions: RegionConfig[] = features.map((f) => {
  const g = featurePolygons(f.geometry);
  if ('problem' in g) throw new Error(g.problem);
  const id = regionIdOf(f.properties.code);
  return { id, name: id, shape: { kind: 'multipolygon', polygons: g.polygons }, utcOffsetHours: 0, teams: [] };
});
const indicator: IndicatorConfig = {
  id: 'tmax-day',
  name: 'daily maximum temperature',
  kind: 'tmax-mean',
  windowDays: 1,
  threshold: { kind: 'absolute', value: 50, units: '%' },
  regionThresholds: {},
  trendClimate: false,
  aggregate: 'mean',
  tiers: ['days'],
  params: {},
  regionValue: { weights: 'area', shareAbove: LEVEL },
};

describe('share of the area above a level vs numpy + shapely', () => {
  const nc = join(mkdtempSync(join(tmpdir(), 'forelight-share-')), 'tas.nc');
  const reference = JSON.parse(
    execFileSync('/usr/bin/python3', [join(import.meta.dirname, 'region_means_reference.py'), nc], {
      input: JSON.stringify({
        regions: features.map((f) => ({ id: regionIdOf(f.properties.code), geometry: f.geometry })),
        share_above_c: LEVEL,
      }),
      cwd: import.meta.dirname,
    }).toString(),
  ) as Record<string, number[]>;

  it('every district, every day; the shares are not all 0 or 100 %, so the level splits cells', async () => {
    const series = (await readFile(extractRegionSeries, nc, { tmax: 'tas' }, readRegions({ regions, indicators: [indicator] }), {}, []))!;
    const partial: string[] = [];
    for (const region of regions) {
      const got = regionIndicator(indicator, series.get(regionViewId(region.id, indicator))!, region.id, {});
      expect(got.units).toBe('%');
      reference[region.id].forEach((want, day) => {
        expect(Math.abs(got.data[day] - want), `${region.id} day ${day}`).toBeLessThan(1e-4);
        if (want > 0 && want < 100) partial.push(`${region.id} day ${day}`);
      });
    }
    expect(partial.length).toBeGreaterThanOrEqual(3);
  });
});
