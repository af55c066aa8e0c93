/** Skill table text/CSV (CSV quoting per RFC 4180). */
import { describe, expect, it } from 'vitest';
import { formatSkillTable, type SkillRow } from '../../src/calibrate/skill-table.ts';

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
