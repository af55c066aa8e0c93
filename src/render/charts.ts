/**
 * Exceedance-probability charts, one per region × indicator, drawn as hand-written SVG (no browser) with one
 * panel per tier (days, weeks, months). Each point carries the glyph of the stage its probability reaches, the
 * trigger probabilities are labelled lines, and the normal-year base rate is a dashed line, so the chart reads
 * without colour. PNG copies for e-mail come from resvg with the system DejaVu Sans font.
 */
import { Resvg } from '@resvg/resvg-js';
import type { Tier } from '../types.ts';
import type { Config } from '../config/types.ts';
import { escapeXml, toToken } from './safe-text.ts';
import type { RegionOutcome } from './model.ts';

export interface ChartPoint {
  readonly tick: string;
  readonly probability: number;
  readonly baseRate: number;
  readonly glyph: string;
  /** Skill below the floor: drawn faded with an asterisk on the tick. */
  readonly noSkill: boolean;
}

export interface ChartPanel {
  readonly title: string;
  readonly points: readonly ChartPoint[];
  /** Trigger probabilities of the rules for this indicator and tier. */
  readonly lines: readonly { readonly probability: number; readonly label: string }[];
}

export interface ChartSpec {
  /** File-name stem, unique per region × indicator. */
  readonly key: string;
  /** Indicator id and name the chart shows (the name is the visible heading; `title` the full one). */
  readonly indicator: string;
  readonly indicatorName: string;
  readonly title: string;
  /** Long text alternative: also used as the `<img alt>`. */
  readonly description: string;
  readonly yLabel: string;
  readonly legend: { readonly chance: string; readonly normal: string; readonly noSkill: string };
  readonly panels: readonly ChartPanel[];
}

/** Localised words a chart needs (from `phrases.njk`). */
export interface ChartWords {
  /** Officer's name of an indicator (the catalogue's hazard name). */
  hazard(indicator: string): string;
  title(region: string, indicator: string): string;
  description(region: string, indicator: string, panels: readonly ChartPanel[]): string;
  tier(tier: Tier): string;
  tick(tier: Tier, index: number, start: string): string;
  yLabel: string;
  legend: ChartSpec['legend'];
}

/** Stage glyph a probability reaches by the probability rules alone (display only; the issued stage is the decision's). */
function glyphFor(config: Config, indicator: string, tier: Tier, index: number, p: number): string {
  let rank = 0;
  config.stages.forEach((s, r) => {
    const fires = config.rules.some((rule) => rule.indicator === indicator && rule.tier === tier && rule.stage === s.id
      && rule.probability !== undefined && p >= rule.probability && (rule.leads.length === 0 || rule.leads.includes(index)));
    if (fires && r > rank) rank = r;
  });
  return config.stages[rank].glyph;
}

/** One chart spec per indicator of a region, panels in days → weeks → months order. */
export function buildChartSpecs(config: Config, outcome: RegionOutcome, locale: string, words: ChartWords): ChartSpec[] {
  const order: Tier[] = ['days', 'weeks', 'months'];
  const indicators = [...new Map(outcome.perTier.map((t) => [t.indicator.id, t.indicator])).values()];
  return indicators.map((ind) => {
    const panels = outcome.perTier
      .filter((t) => t.indicator.id === ind.id)
      .sort((a, b) => order.indexOf(a.tier) - order.indexOf(b.tier))
      .map((t): ChartPanel => ({
        title: words.tier(t.tier),
        points: t.probabilities.map((p) => ({
          tick: words.tick(t.tier, p.lead.index, p.lead.start),
          probability: p.probability,
          baseRate: p.baseRate,
          glyph: glyphFor(config, ind.id, t.tier, p.lead.index, p.probability),
          noSkill: p.skill !== null && !p.skill.skilful,
        })),
        lines: config.rules
          .filter((r) => r.indicator === ind.id && r.tier === t.tier && r.probability !== undefined)
          .map((r) => {
            const stage = config.stages.find((s) => s.id === r.stage);
            return { probability: r.probability as number, label: `${stage?.glyph ?? ''} ${stage?.label[locale] ?? r.stage}`.trim() };
          }),
      }));
    return {
      key: toToken(`${outcome.region.id}-${ind.id}`),
      indicator: ind.id,
      indicatorName: words.hazard(ind.id),
      title: words.title(outcome.region.name, words.hazard(ind.id)),
      description: words.description(outcome.region.name, words.hazard(ind.id), panels),
      yLabel: words.yLabel,
      legend: words.legend,
      panels,
    };
  });
}

const PANEL_W = 253;
const LEGEND_W = 250;
const TOP = 56;
const BOTTOM = 250;
const FONT = "'DejaVu Sans', Verdana, Arial, sans-serif";

function num(v: number): string {
  return (Math.round(v * 10) / 10).toString();
}

function drawPanel(panel: ChartPanel, x0: number, width: number): string {
  const left = x0 + 44;
  const right = x0 + width - 70;
  const y = (p: number): number => BOTTOM - p * (BOTTOM - TOP);
  const n = panel.points.length;
  const x = (i: number): number => (n <= 1 ? (left + right) / 2 : left + ((right - left) * i) / (n - 1));
  const out: string[] = [`<g><text x="${num((left + right) / 2)}" y="${TOP - 14}" text-anchor="middle" font-weight="bold" font-size="13">${escapeXml(panel.title)}</text>`];
  for (const g of [0, 0.25, 0.5, 0.75, 1]) {
    out.push(`<line x1="${num(left)}" x2="${num(right)}" y1="${num(y(g))}" y2="${num(y(g))}" stroke="#d9d9d9" stroke-width="1"/>`);
    out.push(`<text x="${num(left - 6)}" y="${num(y(g) + 4)}" text-anchor="end" font-size="11" fill="#444">${g * 100}</text>`);
  }
  for (const line of panel.lines) {
    out.push(`<line x1="${num(left)}" x2="${num(right)}" y1="${num(y(line.probability))}" y2="${num(y(line.probability))}" stroke="#555" stroke-width="1.2" stroke-dasharray="2 3"/>`);
    out.push(`<text x="${num(right + 4)}" y="${num(y(line.probability) + 4)}" font-size="11" fill="#222">${escapeXml(line.label)}</text>`);
  }
  // Missing values (NaN) break the line instead of being drawn at 0.
  const path = (pick: (p: ChartPoint) => number): string => {
    let pen = 'M';
    return panel.points.map((p, i) => {
      const v = pick(p);
      if (!Number.isFinite(v)) { pen = 'M'; return ''; }
      const seg = `${pen}${num(x(i))} ${num(y(v))}`;
      pen = 'L';
      return seg;
    }).filter(Boolean).join(' ');
  };
  const base = path((p) => p.baseRate);
  const chance = path((p) => p.probability);
  if (base) out.push(`<path d="${base}" fill="none" stroke="#777" stroke-width="1.5" stroke-dasharray="6 4"/>`);
  if (chance) out.push(`<path d="${chance}" fill="none" stroke="#4d004b" stroke-width="2.2"/>`);
  panel.points.forEach((p, i) => {
    out.push(`<text x="${num(x(i))}" y="${BOTTOM + 16}" text-anchor="middle" font-size="10.5" fill="#333">${escapeXml(p.tick)}${p.noSkill ? '*' : ''}</text>`);
    if (!Number.isFinite(p.probability)) return;
    const faded = p.noSkill ? ' opacity="0.45"' : '';
    out.push(`<circle cx="${num(x(i))}" cy="${num(y(p.probability))}" r="9" fill="#ffffff"/>`);
    out.push(`<text x="${num(x(i))}" y="${num(y(p.probability) + 6)}" text-anchor="middle" font-size="17" fill="#2a0028"${faded}>${escapeXml(p.glyph)}</text>`);
  });
  out.push(`<line x1="${num(left)}" x2="${num(left)}" y1="${TOP}" y2="${BOTTOM}" stroke="#333"/></g>`);
  return out.join('');
}

/** Drawn width of a chart in CSS pixels (the PNG is twice this). */
export function chartWidth(spec: ChartSpec): number {
  return Math.max(spec.panels.length * PANEL_W, 2 * PANEL_W);
}

/** Standalone SVG document with `role="img"`, `<title>`, `<desc>` and a legend that does not rely on colour. */
export function renderChartSvg(spec: ChartSpec): string {
  const W = chartWidth(spec);
  const width = W / Math.max(spec.panels.length, 1);
  const panels = spec.panels.map((p, i) => drawPanel(p, i * width, width)).join('');
  const perRow = Math.floor(W / LEGEND_W);
  const legend = [
    (x: number, y: number) => `<line x1="${x}" x2="${x + 30}" y1="${y}" y2="${y}" stroke="#4d004b" stroke-width="2.2"/><text x="${x + 36}" y="${y + 4}" font-size="11">${escapeXml(spec.legend.chance)}</text>`,
    (x: number, y: number) => `<line x1="${x}" x2="${x + 30}" y1="${y}" y2="${y}" stroke="#777" stroke-width="1.5" stroke-dasharray="6 4"/><text x="${x + 36}" y="${y + 4}" font-size="11">${escapeXml(spec.legend.normal)}</text>`,
    (x: number, y: number) => `<text x="${x}" y="${y + 4}" font-size="11">* ${escapeXml(spec.legend.noSkill)}</text>`,
  ];
  const rows = Math.ceil(legend.length / perRow);
  const H = BOTTOM + 44 + rows * 18;
  const items = legend.map((draw, i) => draw(16 + (i % perRow) * LEGEND_W, BOTTOM + 46 + Math.floor(i / perRow) * 18)).join('');
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-labelledby="t-${spec.key} d-${spec.key}" font-family="${FONT}">`,
    `<title id="t-${spec.key}">${escapeXml(spec.title)}</title>`,
    `<desc id="d-${spec.key}">${escapeXml(spec.description)}</desc>`,
    `<rect width="${W}" height="${H}" fill="#ffffff"/>`,
    `<text x="12" y="18" font-size="13" font-weight="bold" fill="#111">${escapeXml(spec.indicatorName)}</text>`,
    `<text transform="translate(12 ${(TOP + BOTTOM) / 2}) rotate(-90)" text-anchor="middle" font-size="11" fill="#333">${escapeXml(spec.yLabel)}</text>`,
    panels,
    items,
    '</svg>',
  ].join('\n');
}

/** PNG (2× scale for sharp e-mail display) rendered with system fonts, DejaVu Sans by default. */
export function renderChartPng(svg: string): Uint8Array {
  const resvg = new Resvg(svg, {
    fitTo: { mode: 'zoom', value: 2 },
    font: { loadSystemFonts: true, defaultFontFamily: 'DejaVu Sans' },
  });
  return new Uint8Array(resvg.render().asPng());
}
