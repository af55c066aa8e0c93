/**
 * Forelight's side of the benchmark, run in a child process by bench/run-bench.ts so that its peak RSS
 * is its own. run-bench.ts bundles it first (bin/build.mjs → bench/data/forelight-entry.mjs), as the `forelight`
 * command is bundled by `npm ci`; by hand it also runs from source:
 *
 *   node bin/run-ts.mjs bench/forelight-entry.ts REGIONS_JSON [--check OUT_JSON] [--pipeline HINDCAST_PATTERN] FILE [FILE ...]
 *
 * Prints one JSON line `{"seconds": …, "maxRssKb": …}` on success. With `--check`, writes the first
 * member's series of every region/quantity to OUT_JSON (for the cross-check against the Python baseline).
 */
import { formatDiagnostic } from '../src/core/diagnostics.ts';
import { runContext } from '../src/core/run-context.ts';
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';
import { loadConfig } from '../src/config/load-config.ts';
import type { RegionConfig } from '../src/config/types.ts';
import { BENCH_ISSUE_DATE, benchConfig, INDICATORS, QUANTITIES } from './bench-config.ts';
import { decideStages } from '../src/decide/decide-stages.ts';
import { EMPTY_HISTORY } from '../src/decide/types.ts';
import { silentLogger } from '../src/core/log.ts';
import { analyse } from '../src/pipeline/analyse.ts';
import { tunedThresholds } from '../src/pipeline/decide-now.ts';
import { extractRegionSeries } from '../src/read/extract.ts';
import type { RegionSeries } from '../src/types.ts';

export interface BenchRegion {
  readonly id: string;
  readonly south: number;
  readonly north: number;
  readonly west: number;
  readonly east: number;
}

export function readBenchRegions(path: string): BenchRegion[] {
  return (JSON.parse(readFileSync(path, 'utf8')) as { regions: BenchRegion[] }).regions;
}

const toRegionConfig = (r: BenchRegion): RegionConfig => ({
  id: r.id,
  name: r.id,
  shape: { kind: 'box', south: r.south, north: r.north, west: r.west, east: r.east },
  utcOffsetHours: 0,
  cellRule: 'centre' as const,
  teams: [],
});

/** Extracts every region × quantity series of every file; throws on the first file with problems. */
export async function extractBenchSeries(files: readonly string[], regions: readonly BenchRegion[]): Promise<RegionSeries[]> {
  const configs = regions.map(toRegionConfig);
  const all: RegionSeries[] = [];
  for (const file of files) {
    const { series, problems } = await extractRegionSeries(file, { quantities: QUANTITIES, regions: configs });
    if (problems.length > 0) throw new Error(`${file}: ${problems.length} extraction problems, first: ${problems[0].message}`);
    all.push(...series);
  }
  return all;
}

/**
 * The timed work: Forelight's full pipeline (read → indicators → probabilities → stages) over the 20 boxes and
 * 4 indicators, the model climate of the hindcasts coming from the cache as in operations (the first run fills
 * it). Without a hindcast pattern (the hindcast input set) the files are read and reduced to box means only.
 */
export async function runForelightBench(
  files: readonly string[],
  regions: readonly BenchRegion[],
  hindcastPattern?: string,
): Promise<void> {
  if (!hindcastPattern) {
    await extractBenchSeries(files, regions);
    return;
  }
  const base = await loadConfig();
  for (const file of files) {
    const config = benchConfig(base, file, hindcastPattern, regions.map(toRegionConfig), join(dirname(file), 'cache'));
    const analysis = await analyse(config, runContext({ issueDate: BENCH_ISSUE_DATE, log: silentLogger }));
    if (analysis.problems.length > 0)
      throw new Error(`${file}: ${analysis.problems.length} problems, first: ${formatDiagnostic(analysis.problems[0])}`);
    const expected = regions.length * INDICATORS.length * 6;
    if (analysis.probabilities.length !== expected)
      throw new Error(`${file}: ${analysis.probabilities.length} probabilities, expected ${expected}`);
    decideStages({
      config,
      probabilities: analysis.probabilities,
      history: EMPTY_HISTORY,
      thresholdsFromCostLoss: tunedThresholds(analysis),
    });
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const args = process.argv.slice(2);
  const regions = readBenchRegions(args[0]);
  const option = (name: string): string | undefined => {
    const at = args.indexOf(name);
    return at > 0 ? args[at + 1] : undefined;
  };
  const checkOut = option('--check');
  const hindcastPattern = option('--pipeline');
  const optionIndexes = new Set(
    ['--check', '--pipeline'].flatMap((n) => (args.indexOf(n) > 0 ? [args.indexOf(n), args.indexOf(n) + 1] : [])),
  );
  const files = args.slice(1).filter((_, i) => !optionIndexes.has(i + 1));
  const began = performance.now();
  if (checkOut) {
    const series = await extractBenchSeries(files, regions);
    const firstMember = series.map((s) => ({
      file: s.provenance.file,
      region: s.region,
      variable: s.provenance.variable,
      units: s.units,
      values: Array.from(s.data.subarray(0, s.days.length)),
    }));
    writeFileSync(checkOut, JSON.stringify(firstMember));
  } else {
    await runForelightBench(files, regions, hindcastPattern);
  }
  process.stdout.write(`${JSON.stringify({ seconds: (performance.now() - began) / 1000, maxRssKb: process.resourceUsage().maxRSS })}\n`);
}
