/**
 * Forelight's side of the continental bench set, in a child process so that its peak RSS is its own:
 *
 *   node bin/run-ts.mjs bench/continental/forelight-continental.ts INPUTS_JSON FILE CELLS REGIONS (pipeline | read)
 *
 * The 1,000 (× REGIONS) invented districts of the domain of CELLS × the full one (inputs.ts) are dealt to 5 national
 * configurations (every 5th district), each with exact area-overlap weights. `pipeline`: the 5 configurations are
 * issued together on FILE — read once for all (src/pipeline/shared-reads.ts) → 4 indicators → probabilities against
 * the hindcast climate (from each configuration's cache, or built from the 20 hindcast years when the cache is
 * empty) → stages. `read`: the same shared read of FILE only (the growth rows, whose grids have no hindcasts).
 * Prints one JSON line `{"seconds": …, "regions": …}`. With FORELIGHT_BENCH_RESULTS=FILE (pipeline mode) it also writes
 * each configuration's probabilities and stage decisions to FILE, one JSON line per configuration (non-finite
 * numbers as strings), so that two versions of Forelight can be checked for identical results with `cmp`.
 */
import { join } from 'node:path';
import { readFileSync, writeFileSync } from 'node:fs';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import { decideStages } from '../../src/decide/decide-stages.ts';
import { EMPTY_HISTORY } from '../../src/decide/types.ts';
import { analyse } from '../../src/pipeline/analyse.ts';
import { tunedThresholds } from '../../src/pipeline/decide-now.ts';
import { shareReads } from '../../src/pipeline/shared-reads.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';
import { benchConfig, BENCH_ISSUE_DATE, INDICATORS, QUANTITIES } from '../bench-config.ts';
import { continentalDistricts, ISSUE_DATE, type ContinentalInputs } from './inputs.ts';

const exact = (_k: string, v: unknown): unknown => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v);

/** Issues the configurations together; returns each one's results as one JSON line (pipeline mode). */
async function issueTogether(configs: readonly Config[], mode: 'pipeline' | 'read', file: string): Promise<string[]> {
  const results: string[] = [];
  const shared = shareReads(configs, extractRegionSeries);
  await Promise.all(
    configs.map(async (config, i) => {
      try {
        if (mode === 'read') {
          const r = await shared.forConfig(i)(file, { quantities: QUANTITIES, regions: config.regions });
          if (r.problems.length > 0) throw new Error(`${file}: ${r.problems[0].message}`);
          if (r.series.length !== config.regions.length * 3) throw new Error(`${file}: ${r.series.length} series`);
          return;
        }
        const analysis = await analyse(config, runContext({ issueDate: BENCH_ISSUE_DATE, log: silentLogger }), {
          extract: shared.forConfig(i),
        });
        if (analysis.problems.length > 0)
          throw new Error(`configuration ${i + 1}: ${analysis.problems.length} problems, first: ${formatDiagnostic(analysis.problems[0])}`);
        const expected = config.regions.length * INDICATORS.length * 6;
        if (analysis.probabilities.length !== expected)
          throw new Error(`configuration ${i + 1}: ${analysis.probabilities.length} probabilities, expected ${expected}`);
        const decided = decideStages({
          config,
          probabilities: analysis.probabilities,
          history: EMPTY_HISTORY,
          thresholdsFromCostLoss: tunedThresholds(analysis),
        });
        if (process.env.FORELIGHT_BENCH_RESULTS) results[i] = JSON.stringify({ probabilities: analysis.probabilities, decided }, exact);
      } finally {
        shared.finished(i);
      }
    }),
  );
  return results;
}

const [inputsJson, file, cells, regions, mode] = process.argv.slice(2);
if (mode !== 'pipeline' && mode !== 'read') throw new Error(`mode must be pipeline or read, got ${mode}`);
if (ISSUE_DATE !== BENCH_ISSUE_DATE) throw new Error('the continental inputs and the bench configuration disagree on the issue date');
const inputs = JSON.parse(readFileSync(inputsJson, 'utf8')) as ContinentalInputs;
const base = await loadConfig();
const districts = continentalDistricts(Number(cells), Number(regions));
const configs = districts.map((r, c) => benchConfig(base, file, inputs.hindcastPattern, r, join(inputs.dir, `cache-${c + 1}`)));
const began = performance.now();
const results = await issueTogether(configs, mode, file);
const seconds = (performance.now() - began) / 1000;
if (process.env.FORELIGHT_BENCH_RESULTS) writeFileSync(process.env.FORELIGHT_BENCH_RESULTS, `${results.join('\n')}\n`);
process.stdout.write(`${JSON.stringify({ seconds, regions: districts.flat().length })}\n`);
