/** What every command that runs the pipeline needs: the validated config and the run context (issue date, logger). */
import { loadConfig } from '../config/load-config.ts';
import type { Config } from '../config/types.ts';
import { createLogger } from '../core/log.ts';
import { runContext, type RunContext } from '../core/run-context.ts';
import { localDate } from '../pipeline/bulletin-run.ts';
import type { IsoDate } from '../types.ts';
import { stringOption, usageError, type ParsedArgs } from './args.ts';

export interface CommandContext {
  readonly config: Config;
  readonly run: RunContext;
}

/** `--date YYYY-MM-DD`, else today in the schedule's time zone. */
export function issueDateOf(args: ParsedArgs, config: Config): IsoDate {
  const given = stringOption(args, 'date');
  if (given === undefined) return localDate(new Date(), config.schedule.timezone);
  if (!/^\d{4}-\d{2}-\d{2}$/.test(given) || Number.isNaN(Date.parse(`${given}T00:00:00Z`))) {
    throw usageError(`--date must be a calendar date YYYY-MM-DD, got '${given}'`);
  }
  return given;
}

/** Loads the config (stops with every problem listed when invalid) and sets up logging. */
export async function commandContext(args: ParsedArgs, command: string): Promise<CommandContext> {
  const config = await loadConfig(stringOption(args, 'config'));
  return { config, run: runContext({ log: createLogger({ base: { command } }), issueDate: issueDateOf(args, config) }) };
}
