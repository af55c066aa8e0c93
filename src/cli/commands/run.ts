/** `forelight run`: one pass now over the newest inputs (or `--dry-run`: what would change, nothing sent). */
import { runOnce } from '../../pipeline/run-once.ts';
import type { ParsedArgs } from '../args.ts';
import { commandContext } from '../context.ts';
import { diffCommand } from './diff.ts';

export async function runCommand(args: ParsedArgs): Promise<number> {
  if (args.options['dry-run']) return diffCommand(args);
  const { config, log, issueDate } = await commandContext(args, 'run');
  const outcome = await runOnce({ config, log, issueDate, mode: 'live', force: args.options.force === true });
  process.stdout.write(outcome.summary + '\n');
  return outcome.exitCode;
}
