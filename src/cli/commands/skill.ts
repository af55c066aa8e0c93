/**
 * `forelight skill`: the hindcast verification table (text or CSV) for the configuration, with progress, a
 * legend line explaining each column, and the probability threshold tuned for every cost/loss rule; `--source`,
 * `--region`, `--indicator` keep only the rows of that id; `--detail` adds hit and false-alarm rates per stage
 * threshold, reliability tables and relative economic value curves (in sample, and leave-one-year-out with 90 %
 * intervals).
 */
import { skillDetailRows, formatSkillDetail, tunedTriggerLine } from '../../calibrate/skill-detail.ts';
import { formatSkillTable, SKILL_LEGEND, skillRow } from '../../calibrate/skill-table.ts';
import type { Config } from '../../config/types.ts';
import { analyse } from '../../pipeline/analyse.ts';
import { formatDiagnostic } from '../../core/diagnostics.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { stringOption, usageError, type ParsedArgs } from '../args.ts';
import { commandContext } from '../context.ts';
import { progressReporter, startProgress } from '../progress.ts';

type Filter = { source?: string; region?: string; indicator?: string };

/** The --source/--region/--indicator filters, each checked against the configured ids. */
function filters(args: ParsedArgs, config: Config): Filter {
  const known: Record<keyof Filter, readonly string[]> = {
    source: config.sources.map((s) => s.id),
    region: config.regions.map((r) => r.id),
    indicator: config.indicators.map((i) => i.id),
  };
  const out: Filter = {};
  for (const key of ['source', 'region', 'indicator'] as const) {
    const v = stringOption(args, key);
    if (v === undefined) continue;
    if (!known[key].includes(v)) throw usageError(`--${key} '${v}' is not a configured ${key}; use one of: ${known[key].join(', ')}`);
    out[key] = v;
  }
  return out;
}

export async function skillCommand(args: ParsedArgs): Promise<number> {
  const { config, run } = await commandContext(args, 'skill');
  const format = args.options.csv ? 'csv' : 'text';
  const keep = filters(args, config);
  const analysis = await analyse(config, run, { onProgress: progressReporter('skill', run), onStartReduced: startProgress(run) });
  const wanted = (ids: Filter) =>
    (['source', 'region', 'indicator'] as const).every((k) => keep[k] === undefined || ids[k] === undefined || keep[k] === ids[k]);
  const climates = analysis.sources
    .filter((s) => wanted({ source: s.source }))
    .flatMap((s) =>
      [...s.climates.entries()].map(([key, climate]) => {
        const [region, indicator] = key.split('|');
        return { ids: { source: s.source, region, indicator }, key, climate };
      }),
    )
    .filter((c) => wanted(c.ids));
  const entries = climates.flatMap((c) => c.climate.skill.map((report) => ({ ids: c.ids, report })));
  const tuned = climates.flatMap((c) =>
    Object.entries(c.climate.tuned).map(([rule, t]) => tunedTriggerLine(`${rule} · ${c.ids.source} · ${c.key.replace('|', ' · ')}`, t)),
  );
  if (args.options.detail) {
    process.stdout.write(
      formatSkillDetail(
        entries.flatMap((e) => skillDetailRows(e.ids, e.report)),
        format,
      ),
    );
  } else {
    process.stdout.write(
      formatSkillTable(
        entries.map((e) => skillRow(e.ids, e.report)),
        format,
      ),
    );
    if (format === 'text') process.stdout.write(`\n${entries.length} rows. ${SKILL_LEGEND}\n`);
  }
  if (format === 'text' && tuned.length > 0)
    process.stdout.write(`\ntriggers tuned for cost/loss rules (maximum relative economic value, Richardson 2000):\n${tuned.join('\n')}\n`);
  for (const p of analysis.problems) process.stderr.write(`skipped: ${formatDiagnostic(p)}\n`);
  return EXIT.ok;
}
