/**
 * The shipped configuration pointed at a generated sample (`generateSample`) instead of `sample-inputs/data`, and
 * with its outputs in a fresh folder, and one exercise run of it, for the tests that run the pipeline end to end on the Veloria sample.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Config } from '../../src/config/types.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import { runOnce, type RunOutcome } from '../../src/pipeline/run-once.ts';
import type { IsoDate } from '../../src/types.ts';

/** `base` reading its forecasts, hindcasts and observations from `sampleDir`. */
export function onSample(base: Config, sampleDir: string): Config {
  const move = (p: string) => p.replace(/.*sample-inputs\/data/, sampleDir);
  return {
    ...base,
    sources: base.sources.map((s) => ({ ...s, forecast: s.forecast.map(move), hindcast: s.hindcast && move(s.hindcast) })),
    observations: base.observations && { ...base.observations, path: move(base.observations.path) },
  };
}

/** `config` writing its ledger, outbox, archive and skill cache under `dir`. */
export function outputsIn(config: Config, dir: string): Config {
  return {
    ...config,
    ledger: join(dir, 'ledger.sqlite'),
    delivery: { ...config.delivery, outbox: join(dir, 'outbox'), archive: join(dir, 'archive') },
    calibration: { ...config.calibration, cacheDir: join(dir, 'cache') },
  };
}

/** One exercise run of `config` on `issueDate` (07:30 UTC), and the one run.json it archived. */
export async function exerciseRun<R = unknown>(config: Config, issueDate: IsoDate): Promise<{ outcome: RunOutcome; runJson: R }> {
  const outcome = await runOnce({
    config,
    run: runContext({ log: silentLogger, issueDate, now: () => new Date(`${issueDate}T07:30:00Z`) }),
    mode: 'exercise',
  });
  const archive = config.delivery.archive;
  const files = readdirSync(archive, { recursive: true, encoding: 'utf8' }).filter((f) => f.endsWith('run.json'));
  if (files.length !== 1) throw new Error(`${archive}: expected one run.json after one run, found ${files.length}`);
  return { outcome, runJson: JSON.parse(readFileSync(join(archive, files[0]), 'utf8')) as R };
}
