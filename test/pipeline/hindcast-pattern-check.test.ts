/**
 * `forelight check` on `hindcast-files` with the files at hand: a pattern that matches no file while the source's
 * forecasts are there, or that has no `{year}`/`{date}` (no start can be told from the path), is an error at its
 * YAML line; before any file of the source has arrived only the grid check's note names it. The files are copies of
 * the ncgen fixture sixhourly.nc (their content is not read here). Placeholder conventions: common practice of data
 * portals, no source.
 */
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { checkConfigFile } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { sourceGridExtents } from '../../src/pipeline/grid-extents.ts';
import { hindcastPatternProblems } from '../../src/pipeline/pattern-check.ts';

const SIXHOURLY = join(import.meta.dirname, '../fixtures/regions/sixhourly.nc');
const MINIMAL = join(import.meta.dirname, '../config/fixtures/minimal.yaml');
const tmp = mkdtempSync(join(tmpdir(), 'forelight-hcpattern-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

let n = 0;
/** minimal.yaml (forecast-files on line 7) with `hindcast-files: <pattern>` on line 8 and the given files in its folder. */
async function checked(pattern: string, files: string[]) {
  const dir = join(tmp, `c${++n}`);
  mkdirSync(dir, { recursive: true });
  for (const f of files) {
    mkdirSync(dirname(join(dir, f)), { recursive: true });
    copyFileSync(SIXHOURLY, join(dir, f));
  }
  const text = readFileSync(MINIMAL, 'utf8').replace(
    'forecast-files: data/w_{date}.nc',
    `forecast-files: data/w_{date}.nc\n    hindcast-files: ${pattern}`,
  );
  writeFileSync(join(dir, 'forelight.yaml'), text);
  const { config, sourceMap, diagnostics } = await checkConfigFile(join(dir, 'forelight.yaml'));
  expect(diagnostics.map(formatDiagnostic)).toEqual([]);
  return { config: config as Config, lines: hindcastPatternProblems(config as Config, sourceMap).map(formatDiagnostic) };
}

describe('forelight check on hindcast-files', () => {
  it('a pattern matching no file while the forecasts are there is an error at its line, naming the key', async () => {
    const { lines } = await checked('hc/w_{year}{mmdd}.nc', ['data/w_20261123.nc', 'hc/w_2010-1123.nc']);
    expect(lines, lines.join('\n')).toHaveLength(1);
    expect(lines[0]).toMatch(/forelight\.yaml:8:\d+: source weekly: hindcast-files \S+hc\/w_\{year\}\{mmdd\}\.nc matches no file, /);
    expect(lines[0]).toMatch(/ — check the spelling and folders of hindcast-files \(placeholders \{date\}, \{year\}, \{mmdd\}/);
  });

  it('a pattern without {year} or {date} that is not read as starts is an error at its line', async () => {
    const { lines } = await checked('hc/w_all.nc', ['data/w_20261123.nc', 'hc/w_all.nc']);
    expect(lines, lines.join('\n')).toHaveLength(1);
    expect(lines[0]).toMatch(
      /:8:\d+: source weekly: hindcast-files \S+hc\/w_all\.nc has no \{year\} or \{date\}, so the start of its 1 file\(s\) cannot be told/,
    );
  });

  it('{mmdd} alone tells no year: an error too', async () => {
    const { lines } = await checked('hc/w_{mmdd}.nc', ['data/w_20261123.nc', 'hc/w_1123.nc']);
    expect(lines, lines.join('\n')).toHaveLength(1);
    expect(lines[0]).toMatch(/:8:\d+: .*has no \{year\} or \{date\}/);
  });

  it('{year}{mmdd} in a folder and the name, {date}: no problem when files match', async () => {
    expect((await checked('hc/{year}/w_{year}{mmdd}.nc', ['data/w_20261123.nc', 'hc/2010/w_20101123.nc'])).lines).toEqual([]);
    expect((await checked('hc/w_{date}.nc', ['data/w_20261123.nc', 'hc/w_20101123.nc'])).lines).toEqual([]);
  });

  it('before any file of the source has arrived: no error, and the grid note names the hindcast pattern too', async () => {
    const { config, lines } = await checked('hc/w_{year}{mmdd}.nc', []);
    expect(lines).toEqual([]);
    const { notes } = await sourceGridExtents(config);
    expect(notes.map((d) => d.message)).toEqual([
      expect.stringMatching(
        /^source 'weekly': no forecast file yet matches \S+w_\{date\}\.nc, nor any hindcast file \S+hc\/w_\{year\}\{mmdd\}\.nc; its grid/,
      ),
    ]);
  });
});
