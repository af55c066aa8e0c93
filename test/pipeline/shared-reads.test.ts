/**
 * Read-once across configurations (src/pipeline/shared-reads.ts) on the Veloria sample: two configurations issued
 * together, with overlapping regions, read each forecast, hindcast and observation file once, and each gets exactly
 * what it gets when run alone (probabilities, problems). The reference is Forelight's own unshared run (common
 * practice, no source): sharing must change how often a file is read, never what is computed.
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config, RegionConfig } from '../../src/config/types.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import { analyse } from '../../src/pipeline/analyse.ts';
import { shareReads } from '../../src/pipeline/shared-reads.ts';
import { extractRegionSeries, type Extractor } from '../../src/read/extract.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { onSample } from '../support/sample-run-config.ts';

const DATE = '2026-11-26';
let sampleDir: string;
let base: Config;

beforeAll(async () => {
  sampleDir = mkdtempSync(join(tmpdir(), 'forelight-shared-sample-'));
  await generateSample(sampleDir);
  base = await loadConfig();
}, 180_000);

/** The shipped configuration on the sample with these regions and its own (empty) cache. */
function configWith(regions: readonly RegionConfig[]): Config {
  const config = onSample(base, sampleDir);
  return { ...config, regions, calibration: { ...config.calibration, cacheDir: mkdtempSync(join(tmpdir(), 'forelight-shared-cache-')) } };
}

/** extractRegionSeries counting its calls per file and variable set (a run reads the first hindcast twice: all variables, and one for the grid check). */
function counting(): { extract: Extractor; calls: Map<string, number> } {
  const calls = new Map<string, number>();
  const extract: Extractor = async (path, request) => {
    const key = `${path} ${Object.keys(request.quantities).sort().join(',')}`;
    calls.set(key, (calls.get(key) ?? 0) + 1);
    return extractRegionSeries(path, request);
  };
  return { extract, calls };
}

const analysed = (config: Config, extract: Extractor) =>
  analyse(config, runContext({ issueDate: DATE, log: silentLogger }), { extract }).then((a) => ({
    probabilities: a.probabilities,
    problems: a.problems,
  }));

async function together(configs: readonly Config[]) {
  const { extract, calls } = counting();
  const shared = shareReads(configs, extract);
  const results = await Promise.all(configs.map((c, i) => analysed(c, shared.forConfig(i)).finally(() => shared.finished(i))));
  return { results, calls };
}

describe('several configurations issued together read each file once', () => {
  it('overlapping regions: one extraction per file, and each configuration gets what it gets alone', async () => {
    const regions = base.regions;
    expect(regions.length).toBeGreaterThanOrEqual(3);
    const a = configWith(regions.slice(0, -1));
    const b = configWith(regions.slice(1));
    const alone = counting();
    const soloA = await analysed(a, alone.extract);
    const soloB = await analysed(b, alone.extract);
    const { results, calls } = await together([configWith(a.regions), configWith(b.regions)]);
    expect(results[0]).toEqual(soloA);
    expect(results[1]).toEqual(soloB);
    expect(soloA.probabilities.length).toBeGreaterThan(0);
    expect([...calls.keys()].sort()).toEqual([...alone.calls.keys()].sort());
    for (const [path, n] of calls) {
      expect(n, path).toBe(1);
      expect(alone.calls.get(path), path).toBe(2);
    }
  }, 300_000);

  it('one id for two different regions: each configuration gets its own region, read in two layers of one file', async () => {
    const [first, second] = base.regions;
    const other: RegionConfig = { ...first, shape: second.shape };
    const a = configWith([first, second]);
    const b = configWith([other]);
    const soloA = await analysed(a, extractRegionSeries);
    const soloB = await analysed(b, extractRegionSeries);
    const { results, calls } = await together([configWith(a.regions), configWith(b.regions)]);
    expect(results[0]).toEqual(soloA);
    expect(results[1]).toEqual(soloB);
    const own = (r: typeof soloA) => r.probabilities.filter((p) => p.region === first.id).map((p) => p.probability);
    expect(own(soloB)).not.toEqual(own(soloA));
    for (const [path, n] of calls) expect(n, path).toBe(2);
  }, 300_000);
});
