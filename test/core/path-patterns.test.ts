/**
 * Path patterns of forecast-files/hindcast-files: placeholders anywhere in the path (folders too), read back from
 * the names on disk. Layouts as data portals publish them (common practice, no source).
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { compactDate, fillPattern, matchPattern, unknownPlaceholders } from '../../src/core/path-patterns.ts';

const root = mkdtempSync(join(tmpdir(), 'forelight-patterns-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));
function touch(...rel: string[]): void {
  for (const r of rel) {
    mkdirSync(join(root, r, '..'), { recursive: true });
    writeFileSync(join(root, r), 'x');
  }
}

describe('path patterns', () => {
  it('fills the given placeholders and leaves the others', () => {
    expect(fillPattern('/d/{var}_{date}_m{member}.nc', { date: compactDate('2026-11-30'), var: 't2m' })).toBe(
      '/d/t2m_20261130_m{member}.nc',
    );
  });

  it('matches placeholders in folders and file names, a repeated one with the same value only', () => {
    touch('2001/hc_20011130.nc', '2002/hc_20021130.nc', '2002/hc_20031130.nc', '2003/notes.txt');
    const found = matchPattern(join(root, '{year}/hc_{year}{mmdd}.nc'));
    expect(found.map((f) => f.values)).toEqual([
      { year: '2001', mmdd: '1130' },
      { year: '2002', mmdd: '1130' },
    ]);
  });

  it('member numbers and member groups; a fixed last segment must exist', () => {
    touch('ens/t2m_m00-09.nc', 'ens/t2m_m10-19.nc', 'ens/t2m_m20.nc', 'ens/tp_m00-09.nc');
    expect(matchPattern(join(root, 'ens/t2m_m{member}.nc')).map((f) => f.values.member)).toEqual(['00-09', '10-19', '20']);
    expect(matchPattern(join(root, 'ens/tp_m00-09.nc'))).toHaveLength(1);
    expect(matchPattern(join(root, 'ens/none.nc'))).toEqual([]);
    expect(matchPattern(join(root, 'gone/{member}/x.nc'))).toEqual([]);
  });

  it('names unknown placeholders (a typo) once each', () => {
    expect(unknownPlaceholders('/d/{data}_{var}_{data}.nc')).toEqual(['data']);
  });
});
