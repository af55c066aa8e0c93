/** `forelight skill`: the hindcast verification table (text or CSV) for the configuration, with progress. */
import { formatSkillTable, skillRow } from '../../calibrate/skill-table.ts';
import { analyse } from '../../pipeline/analyse.ts';
import { EXIT } from '../../schedule/exit-codes.ts';
import type { ParsedArgs } from '../args.ts';
import { commandContext } from '../context.ts';
import { progressBar } from '../progress.ts';

export async function skillCommand(args: ParsedArgs): Promise<number> {
  const { config, log, issueDate } = await commandContext(args, 'skill');
  const analysis = await analyse(config, issueDate, log, progressBar('skill'));
  const rows = analysis.sources.flatMap((s) =>
    [...s.climates.entries()].flatMap(([key, climate]) => {
      const [region, indicator] = key.split('|');
      return climate.skill.map((report) => skillRow({ source: s.source, region, indicator }, report));
    }),
  );
  process.stdout.write(formatSkillTable(rows, args.options.csv ? 'csv' : 'text'));
  if (!args.options.csv) process.stdout.write(`\n${rows.length} rows; "potential" = perfect-model estimate (no observations), not demonstrated skill.\n`);
  for (const p of analysis.problems) process.stderr.write(`skipped: ${p}\n`);
  return EXIT.ok;
}
