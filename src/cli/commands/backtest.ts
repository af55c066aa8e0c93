/** `forelight backtest`: replay the configured rules over every hindcast start, with hits, misses and false alarms. */
import { backtestRules, formatBacktest } from '../../decide/backtest.ts';
import { analyse } from '../../pipeline/analyse.ts';
import { backtestCases } from '../../pipeline/backtest-cases.ts';
import { tunedThresholds } from '../../pipeline/decide-now.ts';
import { EXIT } from '../../core/exit-codes.ts';
import type { ParsedArgs } from '../args.ts';
import { commandContext } from '../context.ts';
import { progressReporter, startProgress } from '../progress.ts';

export async function backtestCommand(args: ParsedArgs): Promise<number> {
  const { config, run } = await commandContext(args, 'backtest');
  const analysis = await analyse(config, run, { onProgress: progressReporter('backtest', run), onStartReduced: startProgress(run) });
  const cases = backtestCases(config, analysis);
  const rows = backtestRules(config, cases, { thresholdsFromCostLoss: tunedThresholds(analysis) });
  process.stdout.write(formatBacktest(rows, args.options.csv ? 'csv' : 'text'));
  if (!args.options.csv)
    process.stdout.write(
      `\n${cases.length} hindcast start(s) replayed in date order with persistence; skill gate not applied (skill comes from the same hindcasts).\n`,
    );
  return EXIT.ok;
}
