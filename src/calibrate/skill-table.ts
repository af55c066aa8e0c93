/**
 * Skill rows as an aligned text table (terminal) or CSV (RFC 4180: fields with comma, quote or newline are
 * quoted, quotes doubled). Scores print with 3 decimals; NaN prints "n/a" in text and an empty field in CSV.
 */
import type { SkillReport } from './skill.ts';

export interface SkillRow {
  readonly source: string;
  readonly region: string;
  readonly indicator: string;
  /** e.g. "week 2". */
  readonly lead: string;
  readonly basis: 'observed' | 'potential';
  readonly cases: number;
  readonly brierScore: number;
  readonly brierSkillScore: number;
  readonly rocArea: number;
  readonly reliability: number;
  readonly resolution: number;
  readonly skilful: boolean;
}

const COLUMNS: readonly { key: keyof SkillRow; head: string; numeric: boolean }[] = [
  { key: 'source', head: 'source', numeric: false },
  { key: 'region', head: 'region', numeric: false },
  { key: 'indicator', head: 'indicator', numeric: false },
  { key: 'lead', head: 'lead', numeric: false },
  { key: 'basis', head: 'basis', numeric: false },
  { key: 'cases', head: 'cases', numeric: true },
  { key: 'brierScore', head: 'BS', numeric: true },
  { key: 'brierSkillScore', head: 'BSS', numeric: true },
  { key: 'rocArea', head: 'ROC area', numeric: true },
  { key: 'reliability', head: 'REL', numeric: true },
  { key: 'resolution', head: 'RES', numeric: true },
  { key: 'skilful', head: 'skilful', numeric: false },
];

function cell(row: SkillRow, key: keyof SkillRow, nan: string): string {
  const v = row[key];
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (typeof v === 'number') return Number.isNaN(v) ? nan : key === 'cases' ? String(v) : v.toFixed(3);
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
    parts.map((s, i) => (COLUMNS[i].numeric ? s.padStart(widths[i]) : s.padEnd(widths[i]))).join('  ').trimEnd();
  return [line(COLUMNS.map((c) => c.head)), line(widths.map((w) => '-'.repeat(w))), ...cells.map(line)].join('\n') + '\n';
}

/** The table row of one skill report. */
export function skillRow(ids: { source: string; region: string; indicator: string }, r: SkillReport): SkillRow {
  return {
    ...ids, lead: `${r.lead.tier.slice(0, -1)} ${r.lead.index}`, basis: r.basis, cases: r.cases, brierScore: r.brierScore,
    brierSkillScore: r.brierSkillScore, rocArea: r.rocArea, reliability: r.reliability, resolution: r.resolution, skilful: r.summary.skilful,
  };
}
