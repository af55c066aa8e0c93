/** Skill table text/CSV (CSV quoting per RFC 4180). */
import { describe, expect, it } from 'vitest';
import { formatSkillTable, type SkillRow } from '../../src/calibrate/skill-table.ts';
import { formatSkillDetail, skillDetailRows } from '../../src/calibrate/skill-detail.ts';
import { scoreCases } from '../../src/calibrate/skill.ts';

const rows: SkillRow[] = [
  { source: 'subseasonal', region: 'kessan-lowlands', indicator: 'heat-index', lead: 'week 1', basis: 'observed', cases: 20, brierScore: 0.1234, brierSkillScore: 0.31, rocArea: 0.8125, reliability: 0.01, resolution: 0.05, skilful: true },
  { source: 'seasonal', region: 'tulva-delta', indicator: 'malaria, "craig"', lead: 'month 2', basis: 'potential', cases: 300, brierScore: NaN, brierSkillScore: -0.1, rocArea: NaN, reliability: 0, resolution: 0, skilful: false },
];

describe('formatSkillTable', () => {
  it('text: header, rule, aligned columns, numbers right-aligned, NaN as n/a', () => {
    const lines = formatSkillTable(rows, 'text').trimEnd().split('\n');
    expect(lines).toHaveLength(4);
    expect(lines[0]).toMatch(/^source +region +indicator +lead +basis +cases +BS +BSS +ROC area +REL +RES +skilful$/);
    expect(lines[2]).toContain('0.123');
    expect(lines[3]).toContain('n/a');
    const col = (l: string, s: string) => l.indexOf(s) + s.length;
    expect(col(lines[2], ' 20')).toBe(col(lines[3], '300')); // right-aligned cases
    expect(lines[0].indexOf('region')).toBe(lines[2].indexOf('kessan-lowlands'));
  });
  it('csv: RFC 4180 quoting, CRLF, empty field for NaN', () => {
    const csv = formatSkillTable(rows, 'csv').split('\r\n');
    expect(csv[0]).toBe('source,region,indicator,lead,basis,cases,BS,BSS,ROC area,REL,RES,skilful');
    expect(csv[1]).toBe('subseasonal,kessan-lowlands,heat-index,week 1,observed,20,0.123,0.310,0.813,0.010,0.050,yes');
    expect(csv[2]).toBe('seasonal,tulva-delta,"malaria, ""craig""",month 2,potential,300,,-0.100,,0.000,0.000,no');
    expect(csv[3]).toBe('');
  });
});

describe('skill detail (--detail): stage hit/false-alarm rates, reliability table, value curve', () => {
  it('one long-format line per stage threshold, reliability bin and cost/loss ratio, numbers from the report (checks.json example: ver-h, ver-f, ver-far, ver-pss)', () => {
    // The CHECKS.md section 12 example: p and o of 12 cases, warning at p >= 0.5 gives H = 2/3, F = 1/6, FAR = 0.2, PSS = 0.5.
    const p = Float64Array.from([0.1, 0.1, 0.1, 0.1, 0.3, 0.3, 0.3, 0.7, 0.7, 0.7, 0.9, 0.9]);
    const o = Float64Array.from([0, 0, 0, 1, 0, 1, 0, 1, 1, 0, 1, 1]);
    const lead = { tier: 'weeks' as const, index: 2, start: '2026-12-07', end: '2026-12-13' };
    const report = scoreCases(lead, 'observed', { p, o, years: [] }, [0.5], { score: 'rocArea', floor: 0.6, action: 'say-no-skill' }, []);
    const rows = skillDetailRows({ source: 'subseasonal', region: 'orrin-coast', indicator: 'tmax-3day' }, report);
    expect(rows.filter((r) => r[4] === 'stage')).toEqual([['subseasonal', 'orrin-coast', 'tmax-3day', 'week 2', 'stage', '0.50', '0.667', '0.167', '0.200', '0.500']]);
    expect(rows.filter((r) => r[4] === 'reliability').map((r) => [r[5], r[6], r[7]])).toEqual([['0.100', '0.250', '4'], ['0.300', '0.333', '3'], ['0.700', '0.667', '3'], ['0.900', '1.000', '2']]);
    expect(rows.filter((r) => r[4] === 'value')).toHaveLength(19);
    const csv = formatSkillDetail(rows, 'csv').split('\r\n');
    expect(csv[0]).toBe('source,region,indicator,lead,table,x,a,b,c,d');
    expect(csv).toHaveLength(rows.length + 2);
  });
});
