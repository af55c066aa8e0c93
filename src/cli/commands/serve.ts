/**
 * `forelight serve`: service mode. At each slot of the configured schedule it waits (until the configured
 * deadline) for the forecast files of the day, then runs once; a late source falls back to its previous
 * forecast with "based on the forecast of <date>" wording, and nothing new means a notice to the operators.
 * Several `--config`: one service per configuration (own lock, status file, ledger and outputs), reads shared at a slot.
 */
import { loadConfig } from '../../config/load-config.ts';
import { createLogger, type Logger } from '../../core/log.ts';
import { runContext } from '../../core/run-context.ts';
import type { Config } from '../../config/types.ts';
import type { Readers } from '../../pipeline/analyse.ts';
import { checkSeparateOutputs, slotReads } from '../../pipeline/run-several.ts';
import type { Extractor } from '../../read/extract.ts';
import { connectCluster } from '../../cluster/coordinator.ts';
import { localDate } from '../../pipeline/bulletin-run.ts';
import { runOnce } from '../../pipeline/run-once.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { waitForInputs } from '../../schedule/input-arrival.ts';
import { namedForecastFiles } from '../../pipeline/split-files.ts';
import { runService } from '../../schedule/run-service.ts';
import { stringOption, stringOptions, type ParsedArgs } from '../args.ts';
import { startProgress } from '../progress.ts';

/** With `--config` repeated, one service per configuration in this process; those due at the same slot share reads. */
export async function serveCommand(args: ParsedArgs): Promise<number> {
  const files = stringOptions(args, 'config');
  const configs: Config[] = [];
  for (const file of files.length > 0 ? files : [undefined]) configs.push(await loadConfig(file));
  checkSeparateOutputs(configs);
  const logFor = (config: Config) => createLogger({ base: { command: 'serve', ...(configs.length > 1 ? { config: config.file } : {}) } });
  const url = stringOption(args, 'cluster');
  const cluster = url ? await connectCluster(url, { log: logFor(configs[0]), cacheDir: configs[0].calibration.cacheDir }) : null;
  const readsAt = slotReads(configs, cluster?.readers.extract);
  try {
    await Promise.all(configs.map((config, i) => serve(config, logFor(config), (slot) => readsAt(i, slot), cluster?.readers ?? {})));
  } finally {
    await cluster?.close();
  }
  return EXIT.ok;
}

async function serve(
  config: Config,
  log: Logger,
  readsAt: (slot: Date) => { extract: Extractor; finished: () => void },
  workers: Omit<Readers, 'extract'>,
): Promise<void> {
  await runService({
    config,
    log,
    runOnce: async ({ slot, signal, log: rlog }) => {
      const issueDate = localDate(slot, config.schedule.timezone);
      // Seasonal (months-tier) forecasts come once a month: the newest one is used, nobody waits for it.
      const expected = config.sources.filter((s) => s.tier !== 'months').flatMap((s) => namedForecastFiles(s, issueDate));
      const deadline = new Date(slot.getTime() + config.schedule.waitForDataMinutes * 60_000);
      const arrival = await waitForInputs(expected, deadline, config.schedule.pollSeconds, { signal });
      if (arrival.missing.length > 0)
        rlog.warn('forecast files late at the deadline; older forecasts are used where available', { missing: arrival.missing });
      if (signal.aborted)
        return {
          exitCode: EXIT.stopped,
          summary: `stopped by a signal before issuing ${issueDate}; nothing was issued, the next start runs it`,
        };
      const run = runContext({ log: rlog, issueDate, signal });
      const reads = readsAt(slot);
      try {
        return await runOnce({
          config,
          run,
          mode: 'live',
          readers: { reduceStart: workers.reduceStart, calibrateRegion: workers.calibrateRegion, extract: reads.extract },
          onStartReduced: startProgress(run),
        });
      } finally {
        reads.finished();
      }
    },
  });
}
