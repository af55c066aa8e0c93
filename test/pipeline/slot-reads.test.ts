/**
 * The service's read sharing (`slotReads`, src/pipeline/run-several.ts) on a NetCDF file written by netCDF-C's ncgen
 * (test/fixtures/regions/grid360.nc): configurations due at the same slot of their cron schedules read a file once
 * between them; one whose schedule has no such slot takes no part (its share is never waited for); the next slot
 * reads again. Slots are croner's (src/core/next-runs.ts); the counts are Forelight's own rule (no source).
 */
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { computeNextRuns } from '../../src/core/next-runs.ts';
import { slotReads } from '../../src/pipeline/run-several.ts';
import { extractRegionSeries, type ExtractRequest, type Extractor } from '../../src/read/extract.ts';

const FILE = join(import.meta.dirname, '../fixtures/regions/grid360.nc');
let base: Config;
beforeAll(async () => {
  base = await loadConfig();
});

/** The shipped configuration reading FILE as its only source, on `cron`. */
const on = (cron: string): Config => ({
  ...base,
  schedule: { ...base.schedule, cron },
  sources: [{ ...base.sources[0], forecast: [FILE], hindcast: undefined, variables: { tmax: 't2m' } }],
  observations: null,
});

describe('reads shared by the configurations due at one slot', () => {
  it('two due at the slot read once; a third on another day is not waited for; the next slot reads again', async () => {
    let calls = 0;
    const extract: Extractor = (path, request) => (calls++, extractRegionSeries(path, request));
    const configs = [on('30 7 * * 1,4'), on('30 7 * * 1,4'), on('30 7 * * 2')];
    const [slot, next] = computeNextRuns(configs[0].schedule.cron, configs[0].schedule.timezone, new Date('2026-11-22T00:00:00Z'), 2);
    const request: ExtractRequest = { quantities: { tmax: 't2m' }, regions: base.regions.slice(0, 1) };
    const readsAt = slotReads(configs, extract);

    const [a, b] = [readsAt(0, slot), readsAt(1, slot)];
    const [ra, rb] = await Promise.all([a.extract(FILE, request), b.extract(FILE, request)]);
    expect(calls).toBe(1);
    expect(rb.series.map((s) => [...s.data])).toEqual(ra.series.map((s) => [...s.data]));
    // Both took it and the Tuesday configuration is not due on this Monday: nothing is kept for anyone.
    await a.extract(FILE, request);
    expect(calls).toBe(2);

    a.finished();
    b.finished();
    await readsAt(0, next).extract(FILE, request);
    expect(calls).toBe(3);
  });
});
