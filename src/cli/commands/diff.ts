/**
 * `forelight diff`: which region stages would change against the last issued bulletin, from the analysis and the
 * decision only (no rendering; `run --dry-run` rehearses the whole run); nothing is written or sent.
 */
import { diffStages, stageChangeLines } from '../../decide/diff.ts';
import { decideNow } from '../../pipeline/decide-now.ts';
import { formatDiagnostic } from '../../core/diagnostics.ts';
import { EXIT } from '../../core/exit-codes.ts';
import type { ParsedArgs } from '../args.ts';
import { commandContext } from '../context.ts';
import { progressReporter, startProgress } from '../progress.ts';

export async function diffCommand(args: ParsedArgs): Promise<number> {
  const { config, run } = await commandContext(args, 'diff');
  const { issueDate } = run;
  const { analysis, decided, previous } = await decideNow(config, run, {
    onProgress: progressReporter('diff', run),
    onStartReduced: startProgress(run),
  });
  const changes = diffStages(previous, decided.regionStages, decided.decisions);
  const lines = [
    `dry run for ${issueDate} (nothing stored or sent); compared with the last issued bulletin${previous.length === 0 ? ' (none yet)' : ''}`,
  ];
  lines.push(...stageChangeLines(config, decided.regionStages, changes));
  for (const p of analysis.problems) lines.push(`  skipped: ${formatDiagnostic(p)}`);
  process.stdout.write(lines.join('\n') + '\n');
  return EXIT.ok;
}
