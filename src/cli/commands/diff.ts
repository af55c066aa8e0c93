/** `forelight diff` (also `run --dry-run`): which region stages would change against the last issued bulletin; nothing is written or sent. */
import { diffStages } from '../../decide/diff.ts';
import { stageTitle } from '../../decide/types.ts';
import { decideNow } from '../../pipeline/decide-now.ts';
import { formatDiagnostic } from '../../core/diagnostics.ts';
import { EXIT } from '../../core/exit-codes.ts';
import type { ParsedArgs } from '../args.ts';
import { commandContext } from '../context.ts';
import { progressBar } from '../progress.ts';

export async function diffCommand(args: ParsedArgs): Promise<number> {
  const { config, run } = await commandContext(args, 'diff');
  const { issueDate } = run;
  const { analysis, decided, previous } = await decideNow(config, run, { onProgress: progressBar('diff') });
  const label = (id: string | null) => (id === null ? 'none' : stageTitle(config.stages, id));
  const changes = diffStages(previous, decided.regionStages, decided.decisions);
  const lines = [
    `dry run for ${issueDate} (nothing stored or sent); compared with the last issued bulletin${previous.length === 0 ? ' (none yet)' : ''}`,
  ];
  for (const r of decided.regionStages) {
    const c = changes.find((x) => x.region === r.region);
    const name = config.regions.find((x) => x.id === r.region)?.name ?? r.region;
    lines.push(c ? `  ${name}: ${label(c.from)} → ${label(c.to)}  (${c.why})` : `  ${name}: ${label(r.stageId)} (unchanged)`);
  }
  for (const p of analysis.problems) lines.push(`  skipped: ${formatDiagnostic(p)}`);
  process.stdout.write(lines.join('\n') + '\n');
  return EXIT.ok;
}
