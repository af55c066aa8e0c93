/**
 * The model-climate cache on the invented Veloria sample (real NetCDF files): a second analysis of the same issue
 * reads every source's climates from the cache — so the stored entries pass the shape check of
 * calibrate/stored-climate.ts — and gives exactly the probabilities, skill and tuned thresholds computed the first
 * time. A cache entry edited into another shape is recomputed with a note, never used. (Expected values: the first
 * computation itself; no external source.)
 */
import { mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import { analyse } from '../../src/pipeline/analyse.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { onSample } from '../support/sample-run-config.ts';

let config: Config;
const issueDate = '2026-11-26';

beforeAll(async () => {
  const sampleDir = mkdtempSync(join(tmpdir(), 'forelight-sample-'));
  await generateSample(sampleDir);
  const base = await loadConfig();
  const onIt = onSample(base, sampleDir);
  config = { ...onIt, calibration: { ...onIt.calibration, cacheDir: join(sampleDir, 'cache') } };
}, 180_000);

const withHindcasts = (a: Awaited<ReturnType<typeof analyse>>) => a.sources.filter((s) => s.climates.size > 0);

describe('model-climate cache on the Veloria sample', () => {
  it('a second analysis reads every source from the cache and gives the same results; a misshapen entry is recomputed', async () => {
    const run = runContext({ issueDate, log: silentLogger });
    const first = await analyse(config, run);
    expect(withHindcasts(first).length).toBeGreaterThan(0);
    expect(first.sources.every((s) => !s.fromCache && s.cacheNote === '')).toBe(true);
    const second = await analyse(config, run);
    expect(withHindcasts(second).map((s) => [s.source, s.fromCache, s.cacheNote])).toEqual(
      withHindcasts(first).map((s) => [s.source, true, '']),
    );
    expect(second.probabilities).toEqual(first.probabilities);
    expect(second.sources.map((s) => [...s.climates])).toEqual(first.sources.map((s) => [...s.climates]));

    const entry = readdirSync(config.calibration.cacheDir).find((f) => /^skill-[0-9a-f]{64}\.json$/.test(f)) as string;
    writeFileSync(join(config.calibration.cacheDir, entry), JSON.stringify([{ region: 'x' }]));
    const third = await analyse(config, run);
    const notes = third.sources.map((s) => s.cacheNote).filter(Boolean);
    expect(notes).toEqual([expect.stringMatching(/unreadable \(\/0 must have required property '\w+'\); recomputed$/)]);
    expect(third.probabilities).toEqual(first.probabilities);
  }, 600_000);
});
