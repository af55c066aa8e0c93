/** Reliability diagrams in the archive: well-formed SVG (xmllint), one per region × indicator × range with cases, linked from the run page. */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { reliabilityDiagram } from '../../src/calibrate/reliability.ts';
import { writeArchive } from '../../src/render/archive.ts';
import { loadCatalogue } from '../../src/render/catalogue.ts';
import { reliabilityCharts, reliabilitySvg } from '../../src/render/reliability-chart.ts';
import { renderBulletins } from '../../src/render/render-bulletins.ts';
import type { BulletinRun } from '../../src/render/model.ts';
import { mulberry32 } from '../support/rng.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

const t = loadCatalogue().forLocale('en');
const rand = mulberry32(5);
const p = Array.from({ length: 60 }, () => Math.floor(rand() * 11) / 10);
const diagram = reliabilityDiagram(
  p,
  p.map((x) => (rand() < x ? 1 : 0)),
  { resamples: 500, seed: 1 },
);

/** The sample run with a reliability diagram on every lead that has skill figures. */
function runWithDiagrams(): BulletinRun {
  const run = sampleRun();
  return {
    ...run,
    regions: run.regions.map((r) => ({
      ...r,
      perTier: r.perTier.map((tier) => ({
        ...tier,
        probabilities: tier.probabilities.map((q) => (q.skill ? { ...q, skill: { ...q.skill, reliability: diagram } } : q)),
      })),
    })),
  };
}

describe('reliability diagrams (Bröcker & Smith 2007 consistency bars)', () => {
  it('one well-formed SVG with a dot per bin and a bar per bin with resamples (xmllint)', () => {
    const svg = reliabilitySvg(diagram, 'Reliability <test> & co', t);
    const dir = mkdtempSync(join(tmpdir(), 'forelight-rel-'));
    writeFileSync(join(dir, 'r.svg'), svg);
    execFileSync('xmllint', ['--noout', join(dir, 'r.svg')]);
    expect((svg.match(/<circle /g) ?? []).length).toBe(diagram.bins.length);
    expect((svg.match(/stroke-width="5"/g) ?? []).length).toBe(diagram.bins.filter((b) => Number.isFinite(b.consistencyLow)).length);
    expect(svg).toContain('Reliability &lt;test&gt; &amp; co');
  });

  it('one chart per region × indicator × range with verification cases; none without', () => {
    const run = runWithDiagrams();
    const charts = reliabilityCharts(run.regions, t, (id) => id);
    const withSkill = run.regions.flatMap((r) => r.perTier.filter((tier) => tier.probabilities.some((q) => q.skill)));
    expect(charts.length).toBe(withSkill.length);
    expect(charts.length).toBeGreaterThan(0);
    expect(reliabilityCharts(sampleRun().regions, t, (id) => id)).toEqual([]); // the plain sample has no diagrams
    expect(new Set(charts.map((c) => c.filename)).size).toBe(charts.length);
  });

  it('the archive writes them under charts/ and the run page links each by region, hazard and lead', async () => {
    const out = await renderBulletins(sampleConfig(), runWithDiagrams());
    const dir = mkdtempSync(join(tmpdir(), 'forelight-rel-archive-'));
    const written = writeArchive(dir, [out.archive]);
    const files = written.filter((w) => /\/charts\/reliability-/.test(w));
    expect(files.length).toBe(out.archive.reliability?.length);
    const page = readFileSync(join(dir, written.find((w) => w.endsWith('/index.html') && w.includes('/')) as string), 'utf8');
    for (const c of out.archive.reliability ?? []) expect(page).toContain(`href="charts/${c.filename}"`);
    expect(page).toMatch(/Reliability diagram: Reliability, Kessan Lowlands, [^<]+ \(60 past cases/);
  });
});
