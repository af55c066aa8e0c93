/**
 * `forelight regions [--config FILE] [--out DIR]`: per source grid, each region's cell count, covered and own
 * area, a warning for regions much smaller than a cell, and a GeoJSON preview plus an SVG map per source
 * (default folder: `regions/` of the archive) so an operator can see what was averaged.
 */
import { mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { loadConfig } from '../../config/load-config.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { writeFileAtomic } from '../../core/write-atomic.ts';
import { regionReport, SMALL_REGION_SHARE } from '../../pipeline/region-report.ts';
import { regionMapSvg, regionPreviewGeoJson } from '../../render/region-map.ts';
import { stringOption, type ParsedArgs } from '../args.ts';

const km2 = (v: number) => (v >= 100 ? Math.round(v).toLocaleString('en-US') : v.toPrecision(3));

export async function regionsCommand(args: ParsedArgs): Promise<number> {
  const config = await loadConfig(stringOption(args, 'config'));
  const out = resolve(stringOption(args, 'out') ?? join(config.delivery.archive, 'regions'));
  const { sources, notes } = await regionReport(config);
  if (sources.length === 0) {
    for (const n of notes) process.stderr.write(`note: ${n}\n`);
    process.stdout.write('no preview written: no source has a forecast file yet to take its grid from (see the notes)\n');
    return EXIT.inputProblem;
  }
  mkdirSync(out, { recursive: true });
  let warnings = 0;
  for (const s of sources) {
    process.stdout.write(`source ${s.source} (${s.file}):\n`);
    const width = Math.max(...s.regions.map((r) => r.region.id.length), 6);
    process.stdout.write(`  ${'region'.padEnd(width)}  cells  covered km²  region km²  rule\n`);
    for (const r of s.regions) {
      process.stdout.write(
        `  ${r.region.id.padEnd(width)}  ${String(r.cells.length).padStart(5)}  ${km2(r.coveredKm2).padStart(11)}  ${km2(r.regionKm2).padStart(10)}  ${r.region.cellRule ?? 'overlap'}\n`,
      );
    }
    for (const r of s.regions.filter((x) => x.small)) {
      warnings++;
      process.stderr.write(
        `warning: region '${r.region.id}' (${km2(r.regionKm2)} km²) is much smaller than a grid cell of source ${s.source} (up to ${km2(r.largestCellKm2)} km², below ${SMALL_REGION_SHARE * 100} %): its value is ${r.cells.length === 1 ? 'that of the one cell it lies in' : `a weighted blend of ${r.cells.length} neighbouring cells`}, land and sea alike — prefer a finer source for it, or read its advisories with that in mind\n`,
      );
    }
    for (const p of s.problems) process.stderr.write(`problem: ${p}\n`);
    writeFileAtomic(join(out, `${s.source}.geojson`), JSON.stringify(regionPreviewGeoJson(s)) + '\n');
    writeFileAtomic(join(out, `${s.source}.svg`), regionMapSvg(s, `${config.country}: regions and the grid cells of source ${s.source}`));
  }
  for (const n of notes) process.stderr.write(`note: ${n}\n`);
  process.stdout.write(`preview: ${sources.map((s) => join(out, `${s.source}.geojson`)).join(', ')} (and .svg maps)\n`);
  // Warnings alone leave the exit code at 0: a small district is allowed, the operator is only told.
  process.stdout.write(`${warnings} warning(s)\n`);
  return sources.some((s) => s.problems.length > 0) ? EXIT.inputProblem : EXIT.ok;
}
