/**
 * Skill rows as an aligned text table (terminal) or CSV (RFC 4180: fields with comma, quote or newline are
 * quoted, quotes doubled). Scores print with 3 decimals, intervals as "low..high"; NaN prints "n/a" in text and
 * an empty field in CSV. `SKILL_LEGEND` explains every column (printed under the text table).
 */
import type { Interval } from './bootstrap.ts';
import { leadName } from './lead-tiers.ts';
import type { SkillReport } from './skill.ts';

export interface SkillRow {
  readonly source: string;
  readonly region: string;
  readonly indicator: string;
  /** e.g. "week 2". */
  readonly lead: string;
  readonly basis: 'observed' | 'potential';
  /** Distinct hindcast years (independent cases) and observed events at this lead. */
  readonly years: number;
  readonly events: number;
  readonly brierScore: number;
  readonly brierSkillScore: number;
  readonly brierSkillScore90: Interval;
  readonly fairBrierSkillScore: number;
  readonly rocArea: number;
  readonly rocArea90: Interval;
  readonly reliability: number;
  readonly resolution: number;
  /** The skill gate's window, its events and the lower end of its fair-BSS interval. */
  readonly gateLeads: string;
  readonly gateEvents: number;
  readonly gateLow: number;
  readonly skilful: boolean;
}

const COLUMNS: readonly { key: keyof SkillRow; head: string; numeric: boolean }[] = [
  { key: 'source', head: 'source', numeric: false },
  { key: 'region', head: 'region', numeric: false },
  { key: 'indicator', head: 'indicator', numeric: false },
  { key: 'lead', head: 'lead', numeric: false },
  { key: 'basis', head: 'basis', numeric: false },
  { key: 'years', head: 'years', numeric: true },
  { key: 'events', head: 'events', numeric: true },
  { key: 'brierScore', head: 'BS', numeric: true },
  { key: 'brierSkillScore', head: 'BSS', numeric: true },
  { key: 'brierSkillScore90', head: 'BSS 90%', numeric: true },
  { key: 'fairBrierSkillScore', head: 'fair BSS', numeric: true },
  { key: 'rocArea', head: 'ROC area', numeric: true },
  { key: 'rocArea90', head: 'ROC 90%', numeric: true },
  { key: 'reliability', head: 'REL', numeric: true },
  { key: 'resolution', head: 'RES', numeric: true },
  { key: 'gateLeads', head: 'gate window', numeric: false },
  { key: 'gateEvents', head: 'gate events', numeric: true },
  { key: 'gateLow', head: 'gate low', numeric: true },
  { key: 'skilful', head: 'skilful', numeric: false },
];

export const SKILL_LEGEND =
  'years = hindcast years verified (independent cases); events = observed events (potential: model-member events); ' +
  'BS = Brier score; BSS = Brier skill score against the observed normal-year frequency (0 = no better, 1 = perfect); ' +
  'BSS 90% = 90 % year-block bootstrap interval; fair BSS = BSS adjusted for ensemble size (Ferro 2014); ' +
  'ROC area = discrimination (0.5 = none, 1 = perfect), not improvement over a normal year; REL, RES = Murphy reliability and resolution; ' +
  'gate window = leads judged together; gate low = lower end of the 90 % interval of their fair BSS; ' +
  'skilful = observed basis, at least the minimum events and gate low above the floor; ' +
  '"potential" = perfect-model estimate (no observations), never counted as skill.';

const num = (v: number, key: keyof SkillRow, nan: string): string =>
  Number.isNaN(v) ? nan : key === 'years' || key.endsWith('vents') ? String(v) : v.toFixed(3);

function cell(row: SkillRow, key: keyof SkillRow, nan: string): string {
  const v = row[key];
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (typeof v === 'number') return num(v, key, nan);
  if (typeof v === 'object') return Number.isNaN(v.low) ? nan : `${v.low.toFixed(2)}..${v.high.toFixed(2)}`;
  return v;
}

const csvField = (s: string): string => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

/** The rows as an aligned text table (numbers right-aligned) or as CSV with a header line. */
export function formatSkillTable(rows: readonly SkillRow[], format: 'text' | 'csv'): string {
  if (format === 'csv') {
    const lines = [COLUMNS.map((c) => csvField(c.head)).join(',')];
    for (const r of rows) lines.push(COLUMNS.map((c) => csvField(cell(r, c.key, ''))).join(','));
    return lines.join('\r\n') + '\r\n';
  }
  const cells = rows.map((r) => COLUMNS.map((c) => cell(r, c.key, 'n/a')));
  const widths = COLUMNS.map((c, i) => Math.max(c.head.length, ...cells.map((row) => row[i].length)));
  const line = (parts: readonly string[]) =>
    parts
      .map((s, i) => (COLUMNS[i].numeric ? s.padStart(widths[i]) : s.padEnd(widths[i])))
      .join('  ')
      .trimEnd();
  return [line(COLUMNS.map((c) => c.head)), line(widths.map((w) => '-'.repeat(w))), ...cells.map(line)].join('\n') + '\n';
}

/** The table row of one skill report. */
export function skillRow(ids: { source: string; region: string; indicator: string }, r: SkillReport): SkillRow {
  const g = r.summary.gate;
  return {
    ...ids,
    lead: leadName(r.lead.tier, r.lead.index),
    basis: r.basis,
    years: r.years.length,
    events: r.events,
    brierScore: r.brierScore,
    brierSkillScore: r.brierSkillScore,
    brierSkillScore90: r.intervals.brierSkillScore,
    fairBrierSkillScore: r.fairBrierSkillScore,
    rocArea: r.rocArea,
    rocArea90: r.intervals.rocArea,
    reliability: r.reliability,
    resolution: r.resolution,
    gateLeads: g.leads,
    gateEvents: g.events,
    gateLow: g.low,
    skilful: r.summary.skilful,
  };
}
