/**
 * The charts of a run per locale: each region's chart specs (`chart-spec.ts`) and their SVGs (`chart-svg.ts`),
 * built once on first use of a locale and shared by its bulletins and the archive.
 */
import type { ChartRef } from './bulletin-context.ts';
import { buildChartSpecs, type ChartSpec } from './chart-spec.ts';
import { chartWidth, renderChartSvg } from './chart-svg.ts';
import { chartWords } from './chart-words.ts';
import type { BulletinRun, RenderConfig } from './model.ts';
import { hazardName, type RegionView } from './region-view.ts';
import type { TemplateEnv } from './template-env.ts';

export interface LocaleCharts {
  /** Region id → its chart specs, one per indicator. */
  readonly specs: Map<string, ChartSpec[]>;
  /** Chart key → SVG document. */
  readonly svg: Map<string, string>;
}

export interface RunCharts {
  chartsFor(locale: string): LocaleCharts;
  /** A region view's chart of an indicator as the templates show it, its image at `src(key)`; null without one. */
  chartRef(locale: string, src: (key: string) => string): (r: RegionView, indicator: string) => ChartRef | null;
}

export function runCharts(config: RenderConfig, run: BulletinRun, env: TemplateEnv): RunCharts {
  const charts = new Map<string, LocaleCharts>();
  const chartsFor = (locale: string): LocaleCharts => {
    let c = charts.get(locale);
    if (!c) {
      const t = env.t(locale);
      const words = chartWords(t, locale, (id) =>
        hazardName(
          t,
          config.indicators.find((i) => i.id === id),
          id,
        ),
      );
      c = { specs: new Map(), svg: new Map() };
      for (const r of run.regions) {
        const specs = buildChartSpecs(config, r, locale, words);
        c.specs.set(r.region.id, specs);
        for (const s of specs) c.svg.set(s.key, renderChartSvg(s));
      }
      charts.set(locale, c);
    }
    return c;
  };
  const chartRef =
    (locale: string, src: (key: string) => string) =>
    (r: RegionView, indicator: string): ChartRef | null => {
      const spec = (chartsFor(locale).specs.get(r.id) ?? []).find((s) => s.indicator === indicator);
      return spec ? { src: src(spec.key), alt: spec.description, title: spec.title, width: chartWidth(spec) } : null;
    };
  return { chartsFor, chartRef };
}
