/**
 * Region values per indicator through a whole run on the invented Veloria sample (real NetCDF, SQLite, outbox):
 * tmax-3day weighted by the people of a GeoTIFF written by GDAL (gdal_translate from an ESRI ASCII grid, EPSG:4326),
 * heat-index as the % of each region's people above 39 °C (threshold 25 %). Checks: the population-weighted series
 * differ from the area means and lie within the range of the region's cells; the share equals, day by day, the
 * people-weighted fraction of the region's cells whose own heat index exceeds 39 °C (recomputed here from the
 * per-cell series with the NWS Heat Index of src/indicators); run.json and the technical note (en and fr) state the
 * choice per indicator; the archive links a map of the cells each region averages (issue 17, maps for the archive).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { regionIndicator } from '../../src/calibrate/region-indicator.ts';
import { readRegions } from '../../src/config/region-views.ts';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config, IndicatorConfig } from '../../src/config/types.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import { computeIndicator } from '../../src/indicators/compute.ts';
import { readFile } from '../../src/pipeline/read-file.ts';
import { runOnce } from '../../src/pipeline/run-once.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { onSample, outputsIn } from '../support/sample-run-config.ts';
import type { Quantity, RegionSeries } from '../../src/types.ts';

const ISSUE = '2026-11-26';
const dir = mkdtempSync(join(tmpdir(), 'forelight-region-value-'));

/** Invented people per 0.25° pixel over Veloria, crowded towards the south-west (row 0 southmost). */
function populationTiff(): string {
  const [south, west, step, rows, cols] = [-16, -6, 0.25, 52, 52];
  const lines = Array.from({ length: rows }, (_, k) => {
    const i = rows - 1 - k;
    return Array.from({ length: cols }, (_, j) => Math.round(20 + 4000 * Math.exp(-((i - 10) ** 2 + (j - 12) ** 2) / 200))).join(' ');
  });
  const asc = join(dir, 'people.asc');
  writeFileSync(
    asc,
    [`ncols ${cols}`, `nrows ${rows}`, `xllcorner ${west}`, `yllcorner ${south}`, `cellsize ${step}`, ...lines].join('\n') + '\n',
  );
  const tif = join(dir, 'people.tif');
  execFileSync('gdal_translate', ['-q', '-of', 'GTiff', '-a_srs', 'EPSG:4326', asc, tif]);
  return tif;
}

function withRegionValues(base: Config, sampleDir: string): Config {
  const indicators = base.indicators.map((i): IndicatorConfig => {
    if (i.id === 'tmax-3day') return { ...i, regionValue: { weights: 'population' } };
    if (i.id === 'heat-index')
      return {
        ...i,
        regionValue: { weights: 'population', shareAbove: 39 },
        threshold: { kind: 'absolute', value: 25, units: '%' },
        regionThresholds: {},
        trendClimate: false,
      };
    return i;
  });
  return { ...outputsIn(onSample(base, sampleDir), dir), indicators, population: { file: populationTiff(), values: 'people-per-pixel' } };
}

let config: Config;
let outcome: Awaited<ReturnType<typeof runOnce>>;

beforeAll(async () => {
  const sampleDir = join(dir, 'sample');
  await generateSample(sampleDir);
  config = withRegionValues(await loadConfig(), sampleDir);
  outcome = await runOnce({
    config,
    run: runContext({ log: silentLogger, issueDate: ISSUE, now: () => new Date(`${ISSUE}T07:30:00Z`) }),
    mode: 'exercise',
  });
}, 400_000);

describe('region values per indicator (population mean, share of people above a level)', () => {
  it("run.json states each indicator's region value; the share indicator's thresholds are in %", () => {
    expect([0, 3]).toContain(outcome.exitCode);
    const doc = JSON.parse(
      readFileSync(
        join(
          config.delivery.archive,
          readdirSync(config.delivery.archive, { recursive: true, encoding: 'utf8' }).find((f) => f.endsWith('run.json'))!,
        ),
        'utf8',
      ),
    );
    const byId = Object.fromEntries(doc.indicators.map((i: { id: string }) => [i.id, i]));
    expect(byId['tmax-3day'].regionValue).toEqual({ weights: 'population', shareAbove: null, populationRaster: config.population!.file });
    expect(byId['heat-index'].regionValue).toEqual({ weights: 'population', shareAbove: 39, populationRaster: config.population!.file });
    expect(byId['excess-heat'].regionValue).toEqual({ weights: 'area', shareAbove: null, populationRaster: null });
    type Threshold = { threshold: { value: number; units: string; origin: string } };
    const heat: Threshold[] = doc.regions.flatMap((r: { tiers: { indicator: { id: string }; probabilities: Threshold[] }[] }) =>
      r.tiers.filter((t) => t.indicator.id === 'heat-index').flatMap((t) => t.probabilities),
    );
    expect(heat.length).toBeGreaterThan(0);
    // 25 % as configured, quantile-mapped on the model's scale at leads where observations say so: still a %.
    for (const p of heat) {
      expect(p.threshold.units).toBe('%');
      expect(p.threshold.value).toBeGreaterThanOrEqual(0);
      expect(p.threshold.value).toBeLessThanOrEqual(100);
    }
    // Every lead the observations cover (here all of them, days included) maps the configured 25 %; others keep it.
    for (const p of heat) expect(p.threshold.origin).toMatch(/^absolute 25 %( quantile-mapped to|, lead .*raw model values)/);
  });

  it('the archive links a region map per source (index and region pages); each map is well-formed SVG (xmllint)', () => {
    const archive = config.delivery.archive;
    const index = readFileSync(join(archive, 'index.html'), 'utf8');
    for (const source of config.sources) {
      expect(index).toContain(`href="maps/${source.id}.svg"`);
      execFileSync('xmllint', ['--noout', join(archive, 'maps', `${source.id}.svg`)]);
      const geo = JSON.parse(readFileSync(join(archive, 'maps', `${source.id}.geojson`), 'utf8'));
      expect(geo.features.filter((f: { properties: { kind: string } }) => f.properties.kind === 'region')).toHaveLength(
        config.regions.length,
      );
    }
    const page = readFileSync(join(archive, 'regions', 'kessan-lowlands.html'), 'utf8');
    expect(page).toContain(`href="../maps/${config.sources[0].id}.svg"`);
  });

  it('the technical note states the choice in English and French', () => {
    const texts = readdirSync(config.delivery.outbox, { recursive: true, encoding: 'utf8' })
      .filter((f) => f.endsWith('.eml') && !f.includes('notice_'))
      .map((f) => readFileSync(join(config.delivery.outbox, f), 'utf8').replace(/=\r?\n/g, ''));
    const all = texts.join('\n');
    expect(all).toMatch(/the people living in the part it shares with the region \(population raster people\.tif\)/);
    expect(all).toMatch(/percentage of the region's people \(population raster people\.tif\) where it is above 39/);
    expect(all).toMatch(/pourcentage de la population de la r=C3=A9gion|pourcentage de la population de la région/);
  });

  it('population means differ from area means and lie within the cells; the share is recomputed from the cells', async () => {
    const source = config.sources.find((s) => s.tier === 'days')!;
    const file = source.forecast[0].replace('{date}', ISSUE.replaceAll('-', ''));
    const series = (await readFile(
      extractRegionSeries,
      file,
      source.variables,
      readRegions(config),
      { population: config.population },
      [],
    ))!;
    const heat = config.indicators.find((i) => i.id === 'heat-index')!;
    for (const region of config.regions) {
      const area = series.get(region.id)!.get('tmax')!;
      const people = series.get(`${region.id}@population`)!.get('tmax')!;
      const cells = series.get(`${region.id}@population-cells`)!;
      const tmaxCells = cells.get('tmax')!.perCell!;
      expect(people.weighting).toBe('population');
      const size = area.data.length;
      const n = tmaxCells.weights.length;
      if (n > 1)
        expect(
          people.data.some((v, i) => Math.abs(v - area.data[i]) > 1e-6),
          region.id,
        ).toBe(true);
      people.data.forEach((v, i) => {
        const own = Array.from({ length: n }, (_, k) => tmaxCells.data[k * size + i]);
        expect(v).toBeGreaterThanOrEqual(Math.min(...own) - 1e-9);
        expect(v).toBeLessThanOrEqual(Math.max(...own) + 1e-9);
      });
      // The share by hand: heat index per cell, then the people-weighted fraction above 39 °C.
      const perCell = Array.from({ length: n }, (_, k) => {
        const inputs = new Map<Quantity, RegionSeries>();
        for (const [q, s] of cells) inputs.set(q, { ...s, data: s.perCell!.data.subarray(k * size, (k + 1) * size) });
        return computeIndicator(heat, inputs).data;
      });
      const share = regionIndicator(heat, cells, region.id, {}).data;
      share.forEach((v, i) => {
        let [above, valid] = [0, 0];
        perCell.forEach((c, k) => {
          if (Number.isNaN(c[i])) return;
          valid += tmaxCells.weights[k];
          if (c[i] > 39) above += tmaxCells.weights[k];
        });
        if (valid === 0) expect(v).toBeNaN();
        else expect(v).toBeCloseTo((100 * above) / valid, 9);
      });
    }
  });
});
