// Exceedance charts: SVG structure and accessibility, PNG rendering with resvg.
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { dateTicks, probabilityTicks } from '../../src/render/chart-axis.ts';
import { chartPngsWithin, renderChartPng } from '../../src/render/chart-png.ts';
import { buildChartSpecs, type ChartWords } from '../../src/render/chart-spec.ts';
import { chartWidth, renderChartSvg } from '../../src/render/chart-svg.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

const words: ChartWords = {
  hazard: (id) => (({ 'tmax-3day': '3-day mean maximum temperature' }) as Record<string, string>)[id] ?? id,
  title: (region, indicator) => `${region} — ${indicator}`,
  description: (region, indicator, panels) => `${region} ${indicator}: ${panels.map((p) => p.title).join(', ')}`,
  tier: (tier) => tier,
  dates: (start, end) => (start === end ? start : `${start}/${end}`),
  yLabel: 'Chance (%)',
  legend: { chance: 'Chance', normal: 'Normal year', line: 'Stage line', noSkill: '* no skill' },
};
const kessan = sampleRun().regions[0];
const [heat, malaria] = buildChartSpecs(sampleConfig(), kessan, 'en', words);

describe('charts', () => {
  it('one chart per indicator with panels days → weeks → months', () => {
    expect(heat.panels.map((p) => p.title)).toEqual(['days', 'weeks', 'months']);
    expect(malaria.panels.map((p) => p.title)).toEqual(['months']);
  });

  it('glyph on each point is the stage its probability reaches under the probability rules (days 3–5 ◑, day 1 ○)', () => {
    // Kessan days: 5,9,19,21,18,11,7 of 30 → 0.17 0.30 0.63 0.70 0.60 0.37 0.23; rules mindful ≥0.4, brace ≥0.6.
    const glyphs = (i: number) => heat.panels[i].points.map((p) => heat.stages[p.rank].glyph).join('');
    expect(glyphs(0)).toBe('○○◑◑◑○○');
    // Weeks rules only look at weeks 2–3: week 1 (0.56) stays ○, week 2 (0.44) is ◔; their lines span weeks 2–3 only.
    expect(glyphs(1)).toBe('○◔○○');
    expect(heat.panels[1].lines.map((l) => [l.first, l.last])).toEqual([
      [2, 3],
      [2, 3],
    ]);
    expect(heat.panels[1].points.map((p) => p.noSkill)).toEqual([false, false, true, true]);
  });

  it('draws labelled trigger lines and base rate, with title, desc and role=img; well-formed XML (xmllint)', () => {
    const svg = renderChartSvg(heat);
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www.w3.org\/2000\/svg" width="360"/);
    expect(svg).toContain('role="img"');
    expect(svg).toContain('<title id="t-kessan-lowlands-tmax-3day">Kessan Lowlands — 3-day mean maximum temperature</title>');
    expect(svg).toContain('<desc id="d-kessan-lowlands-tmax-3day">');
    for (const label of ['◔ Mindful', '◑ Brace', '● Act now']) expect(svg).toContain(`>${label}</text>`);
    // Legend: every stage marker (filled with the stage colour, glyph inside) and the dotted stage line.
    for (const s of heat.stages) expect(svg).toContain(`fill="${s.colour}" stroke="#333"/><text x=`);
    expect(svg).toContain('>Stage line</text>');
    expect(svg).toContain('stroke-dasharray="6 4"');
    const r = spawnSync('xmllint', ['--noout', '-'], { input: svg, encoding: 'utf8' });
    expect(r.status).toBe(0);
  });

  it('escapes hostile text inside the SVG', () => {
    const svg = renderChartSvg({ ...heat, title: '<script>x</script>', indicatorName: 'a & b' });
    expect(svg).not.toContain('<script>');
    expect(svg).toContain('a &amp; b');
  });

  it('renders a PNG at twice the SVG size (resvg, DejaVu Sans)', () => {
    const png = renderChartPng(renderChartSvg(malaria));
    const view = Buffer.from(png);
    expect(view.subarray(1, 4).toString('latin1')).toBe('PNG');
    // IHDR width and height, big-endian at bytes 16 and 20 (PNG specification, ISO/IEC 15948 §11.2.2).
    expect(view.readUInt32BE(16)).toBe(2 * chartWidth(malaria));
    expect(view.readUInt32BE(20)).toBe(2 * Number(/height="(\d+)"/.exec(renderChartSvg(malaria))![1]));
  });
});

describe('charts with missing values', () => {
  it('a NaN probability breaks the line and draws no marker, never a point at 0 (SVG stays well-formed)', () => {
    const points = heat.panels[0].points.map((p, i) => (i === 2 ? { ...p, probability: Number.NaN } : p));
    const svg = renderChartSvg({ ...heat, panels: [{ ...heat.panels[0], points }] });
    expect(svg).not.toContain('NaN');
    expect((svg.match(/<path d="M[^"]*" fill="none" stroke="#2a0028"/) ?? [''])[0].match(/M/g)).toHaveLength(2);
    expect(spawnSync('xmllint', ['--noout', '-'], { input: svg, encoding: 'utf8' }).status).toBe(0);
  });
});

describe('chart axes (d3-scale nice ticks, d3-time date ticks)', () => {
  it('probability ticks are d3 nice ticks 0, 20, … 100', () => {
    expect(probabilityTicks('en').map((t) => t.label)).toEqual(['0', '20', '40', '60', '80', '100']);
  });

  it('date ticks name the month where it changes and never overlap at 360 px (estimated widths)', () => {
    const { ticks } = dateTicks('en', new Date('2026-11-30T00:00:00Z'), new Date('2026-12-08T00:00:00Z'), 34, 282, 11, 2, 358);
    expect(ticks.length).toBeGreaterThan(2);
    expect(ticks[0].label).toMatch(/Nov|Dec/);
    expect(ticks.some((t) => t.label === '1 Dec')).toBe(true);
    ticks.forEach((t, i) => {
      if (i > 0) expect(t.x - t.width / 2).toBeGreaterThan(ticks[i - 1].x + ticks[i - 1].width / 2);
    });
    const months = dateTicks('fr', new Date('2026-12-01T00:00:00Z'), new Date('2027-03-01T00:00:00Z'), 34, 282, 11, 2, 358).ticks.map(
      (t) => t.label,
    );
    expect(months).toEqual(['déc. 2026', 'janv. 2027', 'févr.', 'mars']);
  });
});

describe('charts within the e-mail size budget', () => {
  it('the sharpest zoom whose PNGs fit is used (2× when there is room, then 1.5×, then 1×); charts are never dropped', () => {
    const svgs = [renderChartSvg(heat), renderChartSvg(malaria)];
    const sharp = chartPngsWithin(svgs, 10_000_000);
    expect(sharp.zoom).toBe(2);
    const total2 = sharp.pngs.reduce((n, p) => n + p.length, 0);
    const smaller = chartPngsWithin(svgs, total2 - 1);
    expect(smaller.zoom).toBeLessThan(2);
    expect(smaller.pngs).toHaveLength(2);
    expect(smaller.pngs.reduce((n, p) => n + p.length, 0)).toBeLessThan(total2);
    expect(chartPngsWithin(svgs, 1).zoom).toBe(1);
  });
});
