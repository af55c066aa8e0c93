/** Regions against source grid extents (the lead passes extents read from the NetCDF files). */
import { describe, expect, it } from 'vitest';
import { checkRegionsAgainstGrids } from '../../src/config/check-grids.ts';
import { checkConfigFile } from '../../src/config/load-config.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';

describe('checkRegionsAgainstGrids', async () => {
  const { config: loaded, sourceMap } = await checkConfigFile();
  if (!loaded) throw new Error('the shipped configuration did not load');
  const config = loaded;

  it('accepts a 0..360 grid covering Veloria, including the highlands box that crosses 0°', () => {
    const grids = [
      { source: 'short', latMin: -15, latMax: -4, lonMin: 0, lonMax: 359.5, lon360: true },
      { source: 'seasonal', latMin: -15, latMax: -4, lonMin: -6, lonMax: 6, lon360: false },
    ];
    expect(checkRegionsAgainstGrids(config, grids, sourceMap)).toEqual([]);
  });

  it('a highlands-only 0..360 grid (0..1.5 and 358.5..360) still overlaps the box -1.5..1.5', () => {
    const grids = [{ source: 'short', latMin: -9, latMax: -6.5, lonMin: 358.5, lonMax: 359.9, lon360: true }];
    const problems = checkRegionsAgainstGrids(config, grids, sourceMap);
    expect(problems.some((p) => p.message.includes('marrow-highlands'))).toBe(false);
  });

  it('names the region line in config/regions.yaml for a region outside a grid', () => {
    // Grid over the western half only: Orrin Coast (lon 2..4) lies east of it; line 33 = "- id: orrin-coast".
    const grids = [{ source: 'subseasonal', latMin: -15, latMax: -4, lonMin: -6, lonMax: 1.9, lon360: false }];
    const found = checkRegionsAgainstGrids(config, grids, sourceMap);
    expect(found.map((d) => [d.code, d.place.pointer])).toEqual([
      ['config-grid', `/regions/${config.regions.findIndex((r) => r.id === 'orrin-coast')}`],
    ]);
    expect(found.map(formatDiagnostic)).toEqual([
      'config/regions.yaml:41:3: region orrin-coast (lat -8.5..-6, lon 2..4) lies outside the grid of source subseasonal (lat -15..-4, lon -6..1.9) — check the region coordinates (latitude north positive, longitude east positive, -180..180) or the source files',
    ]);
  });
});
