// Exceedance charts: SVG structure and accessibility, PNG rendering with resvg.
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { buildChartSpecs, chartWidth, renderChartPng, renderChartSvg, type ChartWords } from '../../src/render/charts.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

const words: ChartWords = {
  hazard: (id) => ({ 'tmax-3day': '3-day mean maximum temperature' } as Record<string, string>)[id] ?? id,
  title: (region, indicator) => `${region} — ${indicator}`,
  description: (region, indicator, panels) => `${region} ${indicator}: ${panels.map((p) => p.title).join(', ')}`,
  tier: (tier) => tier,
  tick: (_tier, index) => String(index),
  yLabel: 'Chance (%)',
  legend: { chance: 'Chance', normal: 'Normal year', noSkill: 'no skill' },
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
    expect(heat.panels[0].points.map((p) => p.glyph).join('')).toBe('○○◑◑◑○○');
    // Weeks rules only look at weeks 2–3: week 1 (0.56) stays ○, week 2 (0.44) is ◔.
    expect(heat.panels[1].points.map((p) => p.glyph).join('')).toBe('○◔○○');
    expect(heat.panels[1].points.map((p) => p.noSkill)).toEqual([false, false, true, true]);
  });

  it('draws labelled trigger lines and base rate, with title, desc and role=img; well-formed XML (xmllint)', () => {
    const svg = renderChartSvg(heat);
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www.w3.org\/2000\/svg" width="759"/);
    expect(svg).toContain('role="img"');
    expect(svg).toContain('<title id="t-kessan-lowlands-tmax-3day">Kessan Lowlands — 3-day mean maximum temperature</title>');
    expect(svg).toContain('<desc id="d-kessan-lowlands-tmax-3day">');
    for (const label of ['◔ Mindful', '◑ Brace', '● Act now']) expect(svg).toContain(`>${label}</text>`);
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
    expect(view.readUInt32BE(20)).toBeGreaterThan(500);
  });
});

describe('charts with missing values', () => {
  it('a NaN probability breaks the line and draws no marker, never a point at 0 (SVG stays well-formed)', () => {
    const points = heat.panels[0].points.map((p, i) => (i === 2 ? { ...p, probability: Number.NaN } : p));
    const svg = renderChartSvg({ ...heat, panels: [{ ...heat.panels[0], points }] });
    expect(svg).not.toContain('NaN');
    expect((svg.match(/<path d="M[^"]*" fill="none" stroke="#4d004b"/) ?? [''])[0].match(/M/g)).toHaveLength(2);
    expect(spawnSync('xmllint', ['--noout', '-'], { input: svg, encoding: 'utf8' }).status).toBe(0);
  });
});
