/**
 * Forelight's side of the benchmark, run in a child process by bench/run-bench.ts so that its peak RSS
 * is its own:
 *
 *   node bin/run-ts.mjs bench/forelight-entry.ts REGIONS_JSON [--check OUT_JSON] FILE [FILE ...]
 *
 * Prints one JSON line `{"seconds": …, "maxRssKb": …}` on success. With `--check`, writes the first
 * member's series of every region/quantity to OUT_JSON (for the cross-check against the Python baseline).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { RegionConfig } from '../src/config/types.ts';
import { extractRegionSeries } from '../src/read/extract.ts';
import type { Quantity, RegionSeries } from '../src/types.ts';

export interface BenchRegion {
  readonly id: string;
  readonly south: number;
  readonly north: number;
  readonly west: number;
  readonly east: number;
}

const QUANTITIES: Partial<Record<Quantity, string>> = { tmax: 'tasmax', tmin: 'tasmin', dewpoint: 'tdps' };

export function readBenchRegions(path: string): BenchRegion[] {
  return (JSON.parse(readFileSync(path, 'utf8')) as { regions: BenchRegion[] }).regions;
}

const toRegionConfig = (r: BenchRegion): RegionConfig => ({
  id: r.id,
  name: r.id,
  shape: { kind: 'box', south: r.south, north: r.north, west: r.west, east: r.east },
  utcOffsetHours: 0,
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

/** The timed work. */
export async function runForelightBench(files: readonly string[], regions: readonly BenchRegion[]): Promise<void> {
  await extractBenchSeries(files, regions);
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const args = process.argv.slice(2);
  const regions = readBenchRegions(args[0]);
  const checkAt = args.indexOf('--check');
  const checkOut = checkAt > 0 ? args[checkAt + 1] : undefined;
  const files = args.slice(1).filter((_, i) => checkAt < 0 || (i + 1 !== checkAt && i + 1 !== checkAt + 1));
  const began = performance.now();
  if (checkOut) {
    const series = await extractBenchSeries(files, regions);
    const firstMember = series.map((s) => ({ file: s.provenance.file, region: s.region, variable: s.provenance.variable, units: s.units, values: Array.from(s.data.subarray(0, s.days.length)) }));
    writeFileSync(checkOut, JSON.stringify(firstMember));
  } else {
    await runForelightBench(files, regions);
  }
  process.stdout.write(`${JSON.stringify({ seconds: (performance.now() - began) / 1000, maxRssKb: process.resourceUsage().maxRSS })}\n`);
}
