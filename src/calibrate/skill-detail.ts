/**
 * The full verification behind each skill row, in long format (one line per number set), for `forelight skill
 * --detail`: hit rate, false-alarm rate and ratio and Peirce skill score at each stage probability threshold; the
 * reliability table; the relative economic value curve over cost/loss ratios (Richardson 2000), in sample and judged
 * leave-one-year-out with its 90 % year-block bootstrap interval (trigger-tuning.ts). Text is aligned columns, CSV
 * follows RFC 4180 like the summary table.
 */
import { leadName } from './lead-tiers.ts';
import type { SkillReport } from './skill.ts';
import type { TunedTrigger } from './trigger-tuning.ts';

const HEAD = ['source', 'region', 'indicator', 'lead', 'table', 'x', 'a', 'b', 'c', 'd'];
const LEGEND =
  'tables: stage (x = warn when P >= x; a = hit rate, b = false-alarm rate, c = false-alarm ratio, d = Peirce skill score); ' +
  'reliability (x = forecast probability; a = observed frequency, b = cases); ' +
  'value (x = cost/loss ratio; a = relative economic value, b = best probability threshold, c = hit rate, d = false-alarm rate; ' +
  'threshold chosen and judged on the same years); ' +
  'value-loyo (x = cost/loss ratio; a = value with each year judged by the threshold chosen on the other years, ' +
  'b and c = its 90 % year-block bootstrap interval, d = hit rate)';

const num = (v: number, digits = 3): string => (Number.isFinite(v) ? v.toFixed(digits) : '');

/** Detail lines of one report. */
export function skillDetailRows(ids: { source: string; region: string; indicator: string }, r: SkillReport): string[][] {
  const lead = leadName(r.lead.tier, r.lead.index);
  const head = [ids.source, ids.region, ids.indicator, lead];
  return [
    ...r.stages.map((s) => [
      ...head,
      'stage',
      num(s.probability, 2),
      num(s.hitRate),
      num(s.falseAlarmRate),
      num(s.falseAlarmRatio),
      num(s.peirceSkillScore),
    ]),
    ...r.reliabilityTable.map((t) => [...head, 'reliability', num(t.forecastMean), num(t.observedFrequency), String(t.count), '', '']),
    ...r.value.map((v) => [...head, 'value', num(v.alpha, 2), num(v.value), num(v.threshold), num(v.hitRate), num(v.falseAlarmRate)]),
    ...r.outOfSampleValue.map((v) => [
      ...head,
      'value-loyo',
      num(v.alpha, 2),
      num(v.value),
      num(v.interval.low),
      num(v.interval.high),
      num(v.hitRate),
    ]),
  ];
}

const csvField = (s: string): string => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

export function formatSkillDetail(rows: readonly string[][], format: 'text' | 'csv'): string {
  if (format === 'csv') return [HEAD, ...rows].map((r) => r.map(csvField).join(',')).join('\r\n') + '\r\n';
  const widths = HEAD.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (r: readonly string[]) =>
    r
      .map((s, i) => (i >= 5 ? s.padStart(widths[i]) : s.padEnd(widths[i])))
      .join('  ')
      .trimEnd();
  return [LEGEND, '', line(HEAD), ...rows.map(line)].join('\n') + '\n';
}

const leadList = (leads: readonly number[]): string =>
  leads.length > 1 && leads[leads.length - 1] - leads[0] === leads.length - 1 ? `${leads[0]}–${leads[leads.length - 1]}` : leads.join(', ');

/** One line per tuned cost/loss trigger: the threshold, how it applies to a forecast, and its value out of sample. */
export function tunedTriggerLine(label: string, t: TunedTrigger): string {
  const v = t.value;
  const oos = Number.isFinite(v.value)
    ? `${num(v.value, 2)} (90 % interval ${num(v.interval.low, 2)} to ${num(v.interval.high, 2)})`
    : 'undefined (no contrast)';
  return (
    `  ${label}: warn when at least ${t.hindcastCount} of ${t.hindcastMembers} hindcast members exceed ` +
    `(a forecast: member fraction >= ${num(t.forecastThreshold)}); value judged year by year on thresholds chosen on the ` +
    `other years ${oos}, in sample ${num(v.inSampleValue, 2)}; ${t.basis}, leads ${leadList(t.leads)}, ${t.years} years, ${t.events} events`
  );
}
