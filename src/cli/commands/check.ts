/**
 * `forelight check`: validate a configuration and print every problem as file:line:column, exit 2 when any.
 * With a valid configuration, each source's newest forecast file is opened to check that every region lies on
 * its grid (an error otherwise) and whether a box region holds a cell centre of it (a warning otherwise); a pattern
 * matching no file while the source's others do is reported at its line, and so is a `hindcast-files` pattern that
 * matches no file or tells no start date.
 */
import { checkBoxesBetweenCentres, checkRegionsAgainstGrids } from '../../config/check-grids.ts';
import { checkConfigFile } from '../../config/load-config.ts';
import { sourceGridExtents } from '../../pipeline/grid-extents.ts';
import { populationProblems } from '../../pipeline/population-check.ts';
import { hindcastPatternProblems, unmatchedPatterns } from '../../pipeline/pattern-check.ts';
import { diagnostic, formatDiagnostic, type Diagnostic } from '../../core/diagnostics.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { pdfUnavailable } from '../../render/pdf.ts';
import { stringOption, type ParsedArgs } from '../args.ts';

export async function checkCommand(args: ParsedArgs): Promise<number> {
  const { config, diagnostics, sourceMap } = await checkConfigFile(stringOption(args, 'config'));
  const all = [...diagnostics];
  const notes: Diagnostic[] = [];
  const warnings: Diagnostic[] = [];
  if (config) {
    const extents = await sourceGridExtents(config);
    notes.push(...extents.notes);
    all.push(...checkRegionsAgainstGrids(config, extents.grids, sourceMap));
    all.push(...(await populationProblems(config, sourceMap)));
    all.push(...unmatchedPatterns(config, sourceMap));
    all.push(...(await hindcastPatternProblems(config, sourceMap)));
    warnings.push(...checkBoxesBetweenCentres(config, extents.grids, sourceMap));
    const pdf = pdfUnavailable(config.delivery.pdfChromium);
    if (pdf) notes.push(diagnostic('pdf-unavailable', pdf, '', { pointer: '/delivery/pdf-chromium' }));
  }
  for (const p of all) process.stderr.write(formatDiagnostic(p) + '\n');
  for (const w of warnings) process.stderr.write(`warning: ${formatDiagnostic(w)}\n`);
  for (const n of notes) process.stderr.write(`note: ${formatDiagnostic(n)}\n`);
  if (!config || all.length > 0) {
    process.stderr.write(`forelight: ${all.length} problem(s) in the configuration\n`);
    return EXIT.configInvalid;
  }
  process.stdout.write(
    `${config.file}: ok — ${config.sources.length} sources, ${config.regions.length} regions, ${config.teams.length} teams, ` +
      `${config.indicators.length} indicators, ${config.stages.length} stages, ${config.rules.length} rules\n`,
  );
  return EXIT.ok;
}
