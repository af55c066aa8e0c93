/**
 * Exceedance-probability charts (`chart-spec.ts`) drawn as SVG (no browser) for a phone: 360 px wide, one panel
 * per range stacked. Ticks come from d3 (`chart-axis.ts`); each marker is filled with the colour of the stage its
 * probability reaches and carries that stage's glyph, so the chart reads in black and white; stage lines are
 * dotted and drawn only over the leads their rule covers; the legend lists the lines and every stage marker.
 */
import { dateTicks, probabilityTicks, textWidth } from './chart-axis.ts';
import type { ChartPanel, ChartPoint, ChartSpec } from './chart-spec.ts';
import { escapeXml } from './safe-text.ts';

const WIDTH = 360;
const LEFT = 34;
const RIGHT = 78;
const PANEL_TITLE = 20;
const PLOT_H = 104;
const AXIS_H = 24;
const PANEL_H = PANEL_TITLE + PLOT_H + AXIS_H + 10;
const TICK = 11;
const FONT = "'DejaVu Sans', Verdana, Arial, sans-serif";
const DAY = 86_400_000;

const num = (v: number): string => (Math.round(v * 10) / 10).toString();
const utc = (day: string): Date => new Date(`${day}T00:00:00Z`);

function drawPanel(spec: ChartSpec, panel: ChartPanel, top: number): string {
  const plotTop = top + PANEL_TITLE;
  const bottom = plotTop + PLOT_H;
  const x0 = LEFT;
  const x1 = WIDTH - RIGHT;
  const y = (p: number): number => bottom - p * PLOT_H;
  // Daily leads: the axis is shifted by half a day so that each day's tick sits under its marker.
  const shift = panel.tier === 'days' ? DAY / 2 : 0;
  const start = new Date(utc(panel.points[0].start).getTime() - shift);
  const end = new Date(utc(panel.points[panel.points.length - 1].end).getTime() + DAY - shift);
  const { scale, ticks } = dateTicks(spec.locale, start, end, x0, x1, TICK, 2, WIDTH - 2);
  // Marker at the middle of its lead's days (for a single day: on that day's tick).
  const mid = (p: ChartPoint): number => scale(new Date((utc(p.start).getTime() + utc(p.end).getTime() + DAY) / 2 - shift));
  const edge = (day: string, after: boolean): number => scale(new Date(utc(day).getTime() + (after ? DAY : 0) - shift));
  const out: string[] = [
    `<g><text x="${x0}" y="${top + 14}" font-weight="bold" font-size="13" fill="#111">${escapeXml(panel.title)}</text>`,
  ];
  for (const g of probabilityTicks(spec.locale)) {
    out.push(`<line x1="${x0}" x2="${x1}" y1="${num(y(g.value))}" y2="${num(y(g.value))}" stroke="#e2e2e2"/>`);
    out.push(
      `<text class="tick" x="${x0 - 5}" y="${num(y(g.value) + 4)}" text-anchor="end" font-size="${TICK}" fill="#444">${g.label}</text>`,
    );
  }
  for (const t of ticks) {
    out.push(`<line x1="${num(t.x)}" x2="${num(t.x)}" y1="${bottom}" y2="${bottom + 4}" stroke="#333"/>`);
    out.push(
      `<text class="tick" x="${num(t.x)}" y="${bottom + 19}" text-anchor="middle" font-size="${TICK}" fill="#333">${escapeXml(t.label)}</text>`,
    );
  }
  // Stage lines over the leads their rule covers; labels in the right margin, pushed apart so they never overlap.
  const labels: { y: number; text: string }[] = [];
  for (const line of panel.lines) {
    const a = panel.points[line.first - 1];
    const b = panel.points[line.last - 1];
    const lx0 = edge(a.start, false);
    const lx1 = edge(b.end, true);
    out.push(
      `<line x1="${num(lx0)}" x2="${num(lx1)}" y1="${num(y(line.probability))}" y2="${num(y(line.probability))}" stroke="#333" stroke-width="1.2" stroke-dasharray="2 3"/>`,
    );
    const s = spec.stages[line.rank];
    labels.push({ y: y(line.probability) + 4, text: `${s.glyph} ${s.label}` });
  }
  labels
    .sort((p, q) => p.y - q.y)
    .forEach((l, i, all) => {
      if (i > 0 && l.y < all[i - 1].y + 13) l.y = all[i - 1].y + 13;
    });
  for (const l of labels)
    out.push(`<text class="tick" x="${x1 + 4}" y="${num(l.y)}" font-size="${TICK - 1}" fill="#222">${escapeXml(l.text)}</text>`);
  const path = (pick: (p: ChartPoint) => number): string => {
    let pen = 'M';
    return panel.points
      .map((p) => {
        const v = pick(p);
        if (!Number.isFinite(v)) {
          pen = 'M';
          return '';
        }
        const seg = `${pen}${num(mid(p))} ${num(y(v))}`;
        pen = 'L';
        return seg;
      })
      .filter(Boolean)
      .join(' ');
  };
  const base = path((p) => p.baseRate);
  const chance = path((p) => p.probability);
  if (base) out.push(`<path d="${base}" fill="none" stroke="#777" stroke-width="1.5" stroke-dasharray="6 4"/>`);
  if (chance) out.push(`<path d="${chance}" fill="none" stroke="#2a0028" stroke-width="2"/>`);
  for (const p of panel.points) {
    if (!Number.isFinite(p.probability)) continue;
    const s = spec.stages[p.rank];
    const cx = num(mid(p));
    const cy = num(y(p.probability));
    out.push(
      p.noSkill
        ? `<circle cx="${cx}" cy="${cy}" r="7" fill="#ffffff" stroke="#555" stroke-dasharray="2 2"/><text x="${cx}" y="${num(y(p.probability) + 4)}" text-anchor="middle" font-size="10" fill="#555">*</text>`
        : `<circle cx="${cx}" cy="${cy}" r="7" fill="${s.colour}" stroke="#333"/><text x="${cx}" y="${num(y(p.probability) + 4)}" text-anchor="middle" font-size="10" fill="${s.ink}">${escapeXml(s.glyph)}</text>`,
    );
  }
  out.push(
    `<line x1="${x0}" x2="${x0}" y1="${plotTop}" y2="${bottom}" stroke="#333"/><line x1="${x0}" x2="${x1}" y1="${bottom}" y2="${bottom}" stroke="#333"/></g>`,
  );
  return out.join('');
}

/** Legend items laid out left to right, wrapping within the chart width; returns the SVG and its height. */
function legend(spec: ChartSpec, top: number): { svg: string; height: number } {
  const items: { w: number; draw: (x: number, y: number) => string }[] = [
    {
      w: 34 + textWidth(spec.legend.chance, TICK),
      draw: (x, y) =>
        `<line x1="${x}" x2="${x + 26}" y1="${y - 4}" y2="${y - 4}" stroke="#2a0028" stroke-width="2"/><text class="legend" x="${x + 30}" y="${y}" font-size="${TICK}">${escapeXml(spec.legend.chance)}</text>`,
    },
    {
      w: 34 + textWidth(spec.legend.normal, TICK),
      draw: (x, y) =>
        `<line x1="${x}" x2="${x + 26}" y1="${y - 4}" y2="${y - 4}" stroke="#777" stroke-width="1.5" stroke-dasharray="6 4"/><text class="legend" x="${x + 30}" y="${y}" font-size="${TICK}">${escapeXml(spec.legend.normal)}</text>`,
    },
    {
      w: 34 + textWidth(spec.legend.line, TICK),
      draw: (x, y) =>
        `<line x1="${x}" x2="${x + 26}" y1="${y - 4}" y2="${y - 4}" stroke="#333" stroke-width="1.2" stroke-dasharray="2 3"/><text class="legend" x="${x + 30}" y="${y}" font-size="${TICK}">${escapeXml(spec.legend.line)}</text>`,
    },
    ...spec.stages.map((s) => ({
      w: 22 + textWidth(s.label, TICK),
      draw: (x: number, y: number) =>
        `<circle cx="${x + 7}" cy="${y - 4}" r="7" fill="${s.colour}" stroke="#333"/><text x="${x + 7}" y="${y}" text-anchor="middle" font-size="10" fill="${s.ink}">${escapeXml(s.glyph)}</text><text class="legend" x="${x + 18}" y="${y}" font-size="${TICK}">${escapeXml(s.label)}</text>`,
    })),
    {
      w: textWidth(spec.legend.noSkill, TICK),
      draw: (x, y) => `<text class="legend" x="${x}" y="${y}" font-size="${TICK}">${escapeXml(spec.legend.noSkill)}</text>`,
    },
  ];
  const out: string[] = [];
  let x = 10;
  let row = 0;
  for (const item of items) {
    if (x > 10 && x + item.w > WIDTH - 8) {
      x = 10;
      row += 1;
    }
    out.push(item.draw(x, top + 14 + row * 20));
    x += item.w + 14;
  }
  return { svg: out.join(''), height: (row + 1) * 20 + 8 };
}

/** Words of `text` in lines no wider than `max` px at `size` px. */
function wrap(text: string, size: number, max: number): string[] {
  const lines: string[] = [];
  for (const word of text.split(/\s+/)) {
    const last = lines.at(-1);
    if (last !== undefined && textWidth(`${last} ${word}`, size) <= max) lines[lines.length - 1] = `${last} ${word}`;
    else lines.push(word);
  }
  return lines;
}

/** Drawn width of a chart in CSS pixels (the PNG is twice this). */
export function chartWidth(_spec: ChartSpec): number {
  return WIDTH;
}

/** Standalone SVG document with `role="img"`, `<title>`, `<desc>` and a legend that does not rely on colour. */
export function renderChartSvg(spec: ChartSpec): string {
  const titleLines = wrap(spec.indicatorName, 13, WIDTH - 20);
  const head = 12 + titleLines.length * 16 + 18;
  const panels = spec.panels.map((p, i) => drawPanel(spec, p, head + i * PANEL_H)).join('');
  const legendTop = head + spec.panels.length * PANEL_H;
  const key = legend(spec, legendTop);
  const H = legendTop + key.height;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${WIDTH}" height="${H}" viewBox="0 0 ${WIDTH} ${H}" role="img" aria-labelledby="t-${spec.key} d-${spec.key}" font-family="${FONT}">`,
    `<title id="t-${spec.key}">${escapeXml(spec.title)}</title>`,
    `<desc id="d-${spec.key}">${escapeXml(spec.description)}</desc>`,
    `<rect width="${WIDTH}" height="${H}" fill="#ffffff"/>`,
    ...titleLines.map(
      (line, i) => `<text x="10" y="${18 + i * 16}" font-size="13" font-weight="bold" fill="#111">${escapeXml(line)}</text>`,
    ),
    `<text x="10" y="${head - 6}" font-size="11" fill="#333">${escapeXml(spec.yLabel)}</text>`,
    panels,
    key.svg,
    '</svg>',
  ].join('\n');
}
