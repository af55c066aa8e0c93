/**
 * The shipped configuration pointed at a generated sample (`generateSample`) instead of `sample-inputs/data`, and
 * with its outputs in a fresh folder, for the tests that run the pipeline end to end on the Veloria sample.
 */
import { join } from 'node:path';
import type { Config } from '../../src/config/types.ts';

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
