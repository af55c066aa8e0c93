/**
 * Diagnostics as data (src/core/diagnostics.ts): one text form, context added without losing the inner place,
 * reading order, and the type guard used for diagnostics read back from the ledger and JSON. The ledger round
 * trip uses a real SQLite file. Expected values follow from the documented formats (common practice: the
 * `file:line:column: message` form of compilers and linters, no standard).
 */
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { byPlace, diagnostic, formatDiagnostic, isDiagnostic, uniqueDiagnostics, within } from '../../src/core/diagnostics.ts';
import { ForelightError, InputError, diagnosticOf } from '../../src/core/errors.ts';
import { noticeText } from '../../src/deliver/operator-notice.ts';
import { recordDiagnostics, runDiagnostics } from '../../src/ledger/diagnostics.ts';
import { openLedger, type Ledger } from '../../src/ledger/open-ledger.ts';
import { beginRun } from '../../src/ledger/runs.ts';
import { tempDir } from '../deliver/fixtures.ts';

describe('formatDiagnostic', () => {
  it('puts the known parts of the place in front: file, file:line, file:line:column, or nothing', () => {
    expect(formatDiagnostic(diagnostic('config-rule', 'bad', 'fix it', { file: 'a.yaml', line: 3, column: 7 }))).toBe(
      'a.yaml:3:7: bad — fix it',
    );
    expect(formatDiagnostic(diagnostic('config-rule', 'bad', 'fix it', { file: 'a.yaml', line: 3 }))).toBe('a.yaml:3: bad — fix it');
    expect(formatDiagnostic(diagnostic('input-truncated', 'bad', '', { file: 'x.nc', region: 'r' }))).toBe('x.nc: bad');
    expect(formatDiagnostic(diagnostic('usage', 'bad', 'see --help'))).toBe('bad — see --help');
  });

  it('takes stage and severity from the catalogue unless given', () => {
    expect(diagnostic('forecast-missing', 'm', 'h')).toMatchObject({ stage: 'read', severity: 'warning' });
    expect(diagnostic('forecast-missing', 'm', 'h', {}, { severity: 'note' }).severity).toBe('note');
  });
});

describe('errors carry their diagnostic', () => {
  it('InputError: the file is in the place, and the message is the formatted diagnostic', () => {
    const err = new InputError('input-truncated', 'data/x.nc', 'file is truncated', 'copy it again', { place: { variable: 't2m' } });
    expect(err.diagnostic).toEqual({
      code: 'input-truncated',
      severity: 'error',
      stage: 'read',
      place: { variable: 't2m', file: 'data/x.nc' },
      message: 'file is truncated',
      hint: 'copy it again',
    });
    expect(err.message).toBe('data/x.nc: file is truncated — copy it again');
    expect(err.code).toBe('input-truncated');
  });

  it('diagnosticOf: a ForelightError gives its own, anything else the fallback code with its text on one line', () => {
    const own = new ForelightError('render', 'template', 'boom', 'fix');
    expect(diagnosticOf(own, 'indicator-skipped')).toBe(own.diagnostic);
    expect(diagnosticOf(new Error('a\nb'), 'indicator-skipped')).toMatchObject({ code: 'indicator-skipped', message: 'a | b', hint: '' });
  });

  it('within: prefixes the message, keeps the code and the inner place fields over the outer ones', () => {
    const inner = new InputError('region-empty', 'inner.nc', 'no cells', 'enlarge').diagnostic;
    const outer = within(inner, 'short forecast, region r', { file: 'outer.nc', region: 'r', indicator: 'hi' });
    expect(outer).toMatchObject({
      code: 'region-empty',
      place: { file: 'inner.nc', region: 'r', indicator: 'hi' },
      message: 'short forecast, region r: no cells',
    });
    expect(within(inner, 'x', {}, 'grid-not-checked').code).toBe('grid-not-checked');
  });
});

describe('order, duplicates and the type guard', () => {
  it('byPlace sorts by file, line, column; unplaced ones go last in their order', () => {
    const at = (file: string, line?: number, column?: number, message = '') =>
      diagnostic('config-rule', message, '', { file, line, column });
    const list = [
      at('b.yaml', 1, 1),
      at('x', undefined, undefined, 'first unplaced'),
      at('a.yaml', 10, 2),
      at('a.yaml', 2, 9),
      at('a.yaml', 10, 1),
      at('y', undefined, undefined, 'second unplaced'),
    ];
    expect([...list].sort(byPlace).map(formatDiagnostic)).toEqual([
      'a.yaml:2:9: ',
      'a.yaml:10:1: ',
      'a.yaml:10:2: ',
      'b.yaml:1:1: ',
      'x: first unplaced',
      'y: second unplaced',
    ]);
  });

  it('uniqueDiagnostics keeps the first of equal ones only', () => {
    const d = diagnostic('hindcast-grid', 'm', 'h', { file: 'f' });
    expect(uniqueDiagnostics([d, { ...d }, { ...d, place: { file: 'g' } }])).toHaveLength(2);
  });

  it('isDiagnostic accepts a JSON round trip and refuses unknown codes, stages, severities and place fields', () => {
    const d = diagnostic('input-hdf5', 'm', 'h', { file: 'f', line: 2, region: 'r' });
    expect(isDiagnostic(JSON.parse(JSON.stringify(d)))).toBe(true);
    expect(isDiagnostic({ ...d, code: 'no-such-code' })).toBe(false);
    expect(isDiagnostic({ ...d, stage: 'elsewhere' })).toBe(false);
    expect(isDiagnostic({ ...d, severity: 'fatal' })).toBe(false);
    expect(isDiagnostic({ ...d, place: { line: 'two' } })).toBe(false);
    expect(isDiagnostic({ ...d, place: { colour: 'red' } })).toBe(false);
    expect(isDiagnostic({ ...d, hint: undefined })).toBe(false);
  });
});

describe('edges: the ledger and operator notices', () => {
  const open: Ledger[] = [];
  afterEach(() => {
    for (const l of open.splice(0)) l.close();
  });

  it("the ledger stores a run's diagnostics as data and gives them back in order; a damaged row is named", () => {
    const ledger = openLedger(join(tempDir('diag'), 'ledger.sqlite'));
    open.push(ledger);
    const run = beginRun(ledger, '2026-11-26').run.id;
    const list = [
      diagnostic('input-truncated', 'file is truncated', 'copy it again', { file: 'a.nc' }),
      diagnostic('hindcast-grid', 'other grid', 'regrid', { file: 'b.nc', region: 'r' }),
    ];
    recordDiagnostics(ledger, run, list);
    expect(runDiagnostics(ledger, run)).toEqual(list);
    expect(ledger.db.prepare('SELECT code, severity FROM run_diagnostics ORDER BY position').all()).toEqual([
      { code: 'input-truncated', severity: 'error' },
      { code: 'hindcast-grid', severity: 'warning' },
    ]);
    recordDiagnostics(ledger, run, list.slice(1));
    expect(runDiagnostics(ledger, run)).toEqual(list.slice(1));
    ledger.db.prepare('UPDATE run_diagnostics SET diagnostic_json = \'{"code":"input-truncated"}\'').run();
    expect(() => runDiagnostics(ledger, run)).toThrow(`run_diagnostics row of run ${run} in ledger ${ledger.path} is not a diagnostic`);
  });

  it('an operator notice lists each diagnostic with its code, formatted once', () => {
    expect(noticeText('Nothing issued.', [])).toBe('Nothing issued.');
    expect(noticeText('Nothing issued.', [diagnostic('input-truncated', 'file is truncated', 'copy it again', { file: 'a.nc' })])).toBe(
      'Nothing issued.\n\nProblems found (1):\n- [input-truncated] a.nc: file is truncated — copy it again\n',
    );
  });
});
