/**
 * `forelight serve`: service mode. At each slot of the configured schedule it waits (until the configured
 * deadline) for the forecast files of the day, then runs once; a late source falls back to its previous
 * forecast with "based on the forecast of <date>" wording, and nothing new means a notice to the operators.
 */
import { loadConfig } from '../../config/load-config.ts';
import { createLogger, type Logger } from '../../core/log.ts';
import { runContext } from '../../core/run-context.ts';
import type { Config } from '../../config/types.ts';
import type { Readers } from '../../pipeline/analyse.ts';
import { connectCluster } from '../../cluster/coordinator.ts';
import { localDate } from '../../pipeline/bulletin-run.ts';
import { runOnce } from '../../pipeline/run-once.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { waitForInputs } from '../../schedule/input-arrival.ts';
import { namedForecastFiles } from '../../pipeline/split-files.ts';
import { runService } from '../../schedule/run-service.ts';
import { stringOption, type ParsedArgs } from '../args.ts';
import { startProgress } from '../progress.ts';

export async function serveCommand(args: ParsedArgs): Promise<number> {
  const config = await loadConfig(stringOption(args, 'config'));
  const log = createLogger({ base: { command: 'serve' } });
  const url = stringOption(args, 'cluster');
  const cluster = url ? await connectCluster(url, { log, cacheDir: config.calibration.cacheDir }) : null;
  try {
    await serve(config, log, cluster ?? undefined);
  } finally {
    await cluster?.close();
  }
  return EXIT.ok;
}

async function serve(config: Config, log: Logger, readers: Readers | undefined): Promise<void> {
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
      return runOnce({ config, run, mode: 'live', readers, onStartReduced: startProgress(run) });
    },
  });
}
