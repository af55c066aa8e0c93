/**
 * `forelight skill`: the hindcast verification table (text or CSV) for the configuration, with progress; the
 * probability threshold tuned for every cost/loss rule; `--detail` adds hit and false-alarm rates per stage
 * threshold, reliability tables and relative economic value curves.
 */
import { skillDetailRows, formatSkillDetail } from '../../calibrate/skill-detail.ts';
import { formatSkillTable, skillRow } from '../../calibrate/skill-table.ts';
import { analyse } from '../../pipeline/analyse.ts';
import { formatDiagnostic } from '../../core/diagnostics.ts';
import { EXIT } from '../../core/exit-codes.ts';
import type { ParsedArgs } from '../args.ts';
import { commandContext } from '../context.ts';
import { progressBar } from '../progress.ts';

export async function skillCommand(args: ParsedArgs): Promise<number> {
  const { config, run } = await commandContext(args, 'skill');
  const format = args.options.csv ? 'csv' : 'text';
  const analysis = await analyse(config, run, { onProgress: progressBar('skill') });
  const entries = analysis.sources.flatMap((s) =>
    [...s.climates.entries()].flatMap(([key, climate]) => {
      const [region, indicator] = key.split('|');
      return climate.skill.map((report) => ({ ids: { source: s.source, region, indicator }, report, tuned: climate.tuned }));
    }),
  );
  if (args.options.detail) {
    process.stdout.write(formatSkillDetail(entries.flatMap((e) => skillDetailRows(e.ids, e.report)), format));
    return EXIT.ok;
  }
  process.stdout.write(formatSkillTable(entries.map((e) => skillRow(e.ids, e.report)), format));
  if (format === 'text') {
    process.stdout.write(`\n${entries.length} rows; "potential" = perfect-model estimate (no observations), not demonstrated skill.\n`);
    const tuned = analysis.sources.flatMap((s) =>
      [...s.climates.entries()].flatMap(([key, c]) => Object.entries(c.tuned).map(([rule, p]) => `  ${rule} · ${key.replace('|', ' · ')}: warn when P >= ${p.toFixed(2)}`)),
    );
    if (tuned.length > 0) process.stdout.write(`\nprobability thresholds tuned for cost/loss rules (maximum relative economic value on the hindcasts):\n${tuned.join('\n')}\n`);
  }
  for (const p of analysis.problems) process.stderr.write(`skipped: ${formatDiagnostic(p)}\n`);
  return EXIT.ok;
}
