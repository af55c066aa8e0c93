/** Skill table text/CSV (CSV quoting per RFC 4180). */
import { describe, expect, it } from 'vitest';
import { formatSkillTable, type SkillRow } from '../../src/calibrate/skill-table.ts';
import { formatSkillDetail, skillDetailRows } from '../../src/calibrate/skill-detail.ts';
import { scoreCases } from '../../src/calibrate/skill.ts';
import { gateByLead } from '../../src/calibrate/skill-gate.ts';

const iv = (low: number, high: number) => ({ low, high });
const rows: SkillRow[] = [
  {
    source: 'subseasonal',
    region: 'kessan-lowlands',
    indicator: 'heat-index',
    lead: 'week 1',
    basis: 'observed',
    years: 20,
    events: 6,
    brierScore: 0.1234,
    brierSkillScore: 0.31,
    brierSkillScore90: iv(0.05, 0.52),
    fairBrierSkillScore: 0.33,
    rocArea: 0.8125,
    rocArea90: iv(0.6, 0.95),
    reliability: 0.01,
    resolution: 0.05,
    gateLeads: 'week 1',
    gateEvents: 6,
    gateLow: 0.07,
    skilful: true,
  },
  {
    source: 'seasonal',
    region: 'tulva-delta',
    indicator: 'malaria, "craig"',
    lead: 'month 2',
    basis: 'potential',
    years: 20,
    events: 300,
    brierScore: NaN,
    brierSkillScore: -0.1,
    brierSkillScore90: iv(NaN, NaN),
    fairBrierSkillScore: NaN,
    rocArea: NaN,
    rocArea90: iv(NaN, NaN),
    reliability: 0,
    resolution: 0,
    gateLeads: 'month 2',
    gateEvents: 0,
    gateLow: NaN,
    skilful: false,
  },
];

describe('formatSkillTable', () => {
  it('text: header, rule, aligned columns, numbers right-aligned, intervals low..high, NaN as n/a', () => {
    const lines = formatSkillTable(rows, 'text').trimEnd().split('\n');
    expect(lines).toHaveLength(4);
    expect(lines[0]).toMatch(
      /^source +region +indicator +lead +basis +years +events +BS +BSS +BSS 90% +fair BSS +ROC area +ROC 90% +REL +RES +gate window +gate events +gate low +skilful$/,
    );
    expect(lines[2]).toContain('0.123');
    expect(lines[2]).toContain('0.05..0.52');
    expect(lines[3]).toContain('n/a');
    const col = (l: string, s: string) => l.indexOf(s) + s.length;
    expect(col(lines[2], '  6')).toBe(col(lines[3], '300')); // right-aligned events
    expect(lines[0].indexOf('region')).toBe(lines[2].indexOf('kessan-lowlands'));
  });
  it('csv: RFC 4180 quoting, CRLF, empty field for NaN', () => {
    const csv = formatSkillTable(rows, 'csv').split('\r\n');
    expect(csv[0]).toBe(
      'source,region,indicator,lead,basis,years,events,BS,BSS,BSS 90%,fair BSS,ROC area,ROC 90%,REL,RES,gate window,gate events,gate low,skilful',
    );
    expect(csv[1]).toBe(
      'subseasonal,kessan-lowlands,heat-index,week 1,observed,20,6,0.123,0.310,0.05..0.52,0.330,0.813,0.60..0.95,0.010,0.050,week 1,6,0.070,yes',
    );
    expect(csv[2]).toBe('seasonal,tulva-delta,"malaria, ""craig""",month 2,potential,20,300,,-0.100,,,,,0.000,0.000,month 2,0,,no');
    expect(csv[3]).toBe('');
  });
});

describe('skill detail (--detail): stage hit/false-alarm rates, reliability table, value curve', () => {
  it('one long-format line per stage threshold, reliability bin and cost/loss ratio, numbers from the report (checks.json example: ver-h, ver-f, ver-far, ver-pss)', () => {
    // The CHECKS.md section 12 example: p and o of 12 cases, warning at p >= 0.5 gives H = 2/3, F = 1/6, FAR = 0.2, PSS = 0.5.
    const p = Float64Array.from([0.1, 0.1, 0.1, 0.1, 0.3, 0.3, 0.3, 0.7, 0.7, 0.7, 0.9, 0.9]);
    const o = Float64Array.from([0, 0, 0, 1, 0, 1, 0, 1, 1, 0, 1, 1]);
    const lead = { tier: 'weeks' as const, index: 2, start: '2026-12-07', end: '2026-12-13' };
    const cases = {
      p,
      o,
      members: new Float64Array(12).fill(10),
      caseYears: Float64Array.from(p, (_, k) => 2000 + k),
      years: Array.from(p, (_, k) => 2000 + k),
    };
    const gate = {
      floor: 0,
      minEvents: 5,
      poolLeads: { days: 7, weeks: 1, months: 1 },
      resamples: 1000,
      seed: 1,
      action: 'say-no-skill' as const,
    };
    const verdict = gateByLead([{ lead, basis: 'observed', cases }], gate).get(2)!;
    const report = scoreCases(lead, 'observed', cases, [0.5], gate, verdict, []);
    const rows = skillDetailRows({ source: 'subseasonal', region: 'orrin-coast', indicator: 'tmax-3day' }, report);
    expect(rows.filter((r) => r[4] === 'stage')).toEqual([
      ['subseasonal', 'orrin-coast', 'tmax-3day', 'week 2', 'stage', '0.50', '0.667', '0.167', '0.200', '0.500'],
    ]);
    expect(rows.filter((r) => r[4] === 'reliability').map((r) => [r[5], r[6], r[7]])).toEqual([
      ['0.100', '0.250', '4'],
      ['0.300', '0.333', '3'],
      ['0.700', '0.667', '3'],
      ['0.900', '1.000', '2'],
    ]);
    expect(rows.filter((r) => r[4] === 'value')).toHaveLength(19);
    const csv = formatSkillDetail(rows, 'csv').split('\r\n');
    expect(csv[0]).toBe('source,region,indicator,lead,table,x,a,b,c,d');
    expect(csv).toHaveLength(rows.length + 2);
  });
});
