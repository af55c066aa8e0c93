/**
 * Several configurations issued together (`forelight run --config A --config B`, src/pipeline/run-several.ts) on the
 * Veloria sample: whole runs (ledger, archive, outbox), each configuration with its own. Together they read every
 * file exactly as often as one configuration alone does (once per file and variable set), and each issues exactly
 * what it issues alone (run.json regions, stages and probabilities; the same outbox). The reference is Forelight's
 * own separate runs (common practice, no source): sharing reads must change how often a file is read, never what
 * is issued.
 */
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { EXIT } from '../../src/core/exit-codes.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import type { Readers } from '../../src/pipeline/analyse.ts';
import { runOnce } from '../../src/pipeline/run-once.ts';
import { checkSeparateOutputs, combinedExitCode, runSeveral } from '../../src/pipeline/run-several.ts';
import { extractRegionSeries, type Extractor } from '../../src/read/extract.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { onSample, outputsIn } from '../support/sample-run-config.ts';

const DATE = '2026-11-26';
let sampleDir: string;
let base: Config;

beforeAll(async () => {
  sampleDir = mkdtempSync(join(tmpdir(), 'forelight-several-'));
  await generateSample(sampleDir);
  base = await loadConfig();
}, 180_000);

/** The shipped configuration on the sample, with `regions` and its own ledger, outbox, archive and (empty) cache. */
function configFor(regions: Config['regions']): Config {
  const config = outputsIn(onSample(base, sampleDir), mkdtempSync(join(tmpdir(), 'forelight-several-config-')));
  return { ...config, regions, delivery: { ...config.delivery, smtp: null } };
}

/** extractRegionSeries counting its calls per file and variable set. */
function counting(): { extract: Extractor; calls: Map<string, number> } {
  const calls = new Map<string, number>();
  const extract: Extractor = async (path, request) => {
    const key = `${path} ${Object.keys(request.quantities).sort().join(',')}`;
    calls.set(key, (calls.get(key) ?? 0) + 1);
    return extractRegionSeries(path, request);
  };
  return { extract, calls };
}

const issue = async (config: Config, readers: Readers) => {
  const outcome = await runOnce({ config, run: runContext({ issueDate: DATE, log: silentLogger }), mode: 'live', readers });
  expect(outcome.exitCode, outcome.summary).toBe(EXIT.ok);
  return outcome.exitCode;
};

/** The regions of the run.json an archive holds (stages with every probability behind them). */
function issued(config: Config): unknown {
  const files = readdirSync(config.delivery.archive, { recursive: true, encoding: 'utf8' }).filter((f) => f.endsWith('run.json'));
  expect(files).toHaveLength(1);
  return (JSON.parse(readFileSync(join(config.delivery.archive, files[0]), 'utf8')) as { regions: unknown }).regions;
}
const outbox = (config: Config): number => readdirSync(config.delivery.outbox).filter((f) => f.endsWith('.eml')).length;

describe('configurations issued together', () => {
  it('read each file once between them and issue what each issues alone', async () => {
    const regions = base.regions;
    const alone = [configFor(regions), configFor(regions.slice(1))];
    const aloneCalls: Map<string, number>[] = [];
    for (const c of alone) {
      const { extract, calls } = counting();
      await issue(c, { extract });
      aloneCalls.push(calls);
    }
    const together = [configFor(regions), configFor(regions.slice(1))];
    const { extract, calls } = counting();
    const settled = await runSeveral(together, { extract }, issue);
    expect(settled.map((s) => s.status)).toEqual(['fulfilled', 'fulfilled']);

    expect([...calls.values()].every((n) => n === 1)).toBe(true);
    expect(new Map([...calls].sort())).toEqual(new Map([...aloneCalls[0]].sort())); // the second configuration adds no read
    for (const [i, c] of together.entries()) {
      expect(issued(c)).toEqual(issued(alone[i]));
      expect(outbox(c)).toBe(outbox(alone[i]));
    }
  }, 600_000);

  it('two configurations writing the same ledger or outbox are refused before anything runs, naming both files', () => {
    const a = configFor(base.regions);
    const b = { ...configFor(base.regions), file: '/etc/forelight/other.yaml', ledger: a.ledger };
    expect(() => checkSeparateOutputs([a, b])).toThrow(`${a.file} and /etc/forelight/other.yaml both write the ledger ${a.ledger}`);
    const c = { ...configFor(base.regions), delivery: { ...a.delivery, archive: join(tmpdir(), 'x') } };
    expect(() => checkSeparateOutputs([a, c])).toThrow(/both write the outbox/);
  });

  it('the exit code of several runs is the most serious one (common practice, no source)', () => {
    expect(combinedExitCode([EXIT.ok, EXIT.nothingNew])).toBe(EXIT.nothingNew);
    expect(combinedExitCode([EXIT.nothingNew, EXIT.inputProblem, EXIT.ok])).toBe(EXIT.inputProblem);
    expect(combinedExitCode([EXIT.deliveryFailed, EXIT.unexpected])).toBe(EXIT.unexpected);
    expect(combinedExitCode([EXIT.ok, EXIT.ok])).toBe(EXIT.ok);
  });
});
