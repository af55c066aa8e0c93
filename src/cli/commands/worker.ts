/**
 * `forelight worker --cluster redis://HOST:PORT [--config FILE] [--concurrency N] [--lock-seconds S]`: a cluster
 * worker until SIGTERM/SIGINT (the jobs in hand are finished first). With `--config`, the configuration is checked
 * first, so a worker of the wrong installation stops at once with its problems listed.
 */
import { runClusterWorker } from '../../cluster/worker.ts';
import { loadConfig } from '../../config/load-config.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { createLogger } from '../../core/log.ts';
import { stringOption, usageError, type ParsedArgs } from '../args.ts';

function positiveInteger(args: ParsedArgs, name: string): number | undefined {
  const text = stringOption(args, name);
  if (text === undefined) return undefined;
  if (!/^[1-9]\d*$/.test(text)) throw usageError(`--${name} must be a whole number above 0, got '${text}'`);
  return Number(text);
}

export async function workerCommand(args: ParsedArgs): Promise<number> {
  const url = stringOption(args, 'cluster');
  if (!url) throw usageError('worker needs --cluster redis://HOST:PORT');
  if (stringOption(args, 'config') !== undefined) await loadConfig(stringOption(args, 'config'));
  const log = createLogger({ base: { command: 'worker' } });
  const stop = new AbortController();
  const onSignal = (): void => stop.abort();
  process.once('SIGTERM', onSignal);
  process.once('SIGINT', onSignal);
  try {
    await runClusterWorker(url, {
      log,
      concurrency: positiveInteger(args, 'concurrency'),
      lockSeconds: positiveInteger(args, 'lock-seconds'),
      signal: stop.signal,
    });
  } finally {
    process.off('SIGTERM', onSignal);
    process.off('SIGINT', onSignal);
  }
  return EXIT.ok;
}
