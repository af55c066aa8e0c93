/**
 * What an exceedance-probability chart shows, one per region × indicator: a panel per range (days, weeks, months)
 * with each lead's chance, its normal-year rate and the stage it reaches, and the rules' trigger lines over the
 * leads they cover. Drawn by `chart-svg.ts`.
 */
import type { Tier } from '../types.ts';
import type { RegionOutcome, RenderConfig } from './model.ts';
import { probabilityLines, reachedRank } from './reached-stage.ts';
import { toToken } from './safe-text.ts';
import { TIERS } from './view-model.ts';
import { inkFor } from './stage-view.ts';

export interface ChartStage {
  readonly glyph: string;
  readonly label: string;
  readonly colour: string;
  readonly ink: string;
}

export interface ChartPoint {
  readonly start: string;
  readonly end: string;
  /** Dates of the lead as printed (text equivalent). */
  readonly dates: string;
  readonly probability: number;
  readonly baseRate: number;
  /** Ladder rank the probability reaches at this lead (0 for a lead the skill gate withheld). */
  readonly rank: number;
  /** Skill below the floor: drawn hollow with an asterisk. */
  readonly noSkill: boolean;
}

export interface ChartPanel {
  readonly tier: Tier;
  readonly title: string;
  readonly points: readonly ChartPoint[];
  /** Trigger probabilities of the rules for this indicator and tier, with the leads (1-based) they cover. */
  readonly lines: readonly { readonly probability: number; readonly rank: number; readonly first: number; readonly last: number }[];
}

export interface ChartSpec {
  /** File-name stem, unique per region × indicator. */
  readonly key: string;
  readonly indicator: string;
  readonly indicatorName: string;
  readonly title: string;
  /** Long text alternative: also used as the `<img alt>` and in the plain-text e-mail. */
  readonly description: string;
  readonly locale: string;
  readonly yLabel: string;
  readonly legend: { readonly chance: string; readonly normal: string; readonly line: string; readonly noSkill: string };
  readonly stages: readonly ChartStage[];
  readonly panels: readonly ChartPanel[];
}

/** Localised words a chart needs (from the message catalogue, `chart-words.ts`). */
export interface ChartWords {
  hazard(indicator: string): string;
  title(region: string, hazard: string): string;
  description(region: string, hazard: string, panels: readonly ChartPanel[]): string;
  tier(tier: Tier): string;
  dates(start: string, end: string): string;
  yLabel: string;
  legend: ChartSpec['legend'];
}

/** One chart spec per indicator of a region, panels in days → weeks → months order. */
export function buildChartSpecs(config: RenderConfig, outcome: RegionOutcome, locale: string, words: ChartWords): ChartSpec[] {
  const indicators = [...new Map(outcome.perTier.map((t) => [t.indicator.id, t.indicator])).values()];
  const stages = config.stages.map((s) => ({ glyph: s.glyph, label: s.label[locale] ?? s.id, colour: s.colour, ink: inkFor(s.colour) }));
  return indicators.map((ind) => {
    const panels = outcome.perTier
      .filter((t) => t.indicator.id === ind.id && t.probabilities.length > 0)
      .sort((a, b) => TIERS.indexOf(a.tier) - TIERS.indexOf(b.tier))
      .map((t): ChartPanel => {
        const n = t.probabilities.length;
        return {
          tier: t.tier,
          title: words.tier(t.tier),
          points: t.probabilities.map((p) => {
            const withheld = t.decision.withheldLeads.some((w) => w.tier === p.lead.tier && w.index === p.lead.index);
            return {
              start: p.lead.start,
              end: p.lead.end,
              dates: words.dates(p.lead.start, p.lead.end),
              probability: p.probability,
              baseRate: p.baseRate,
              rank: withheld ? 0 : reachedRank(config, t, p),
              noSkill: withheld || (p.skill !== null && !p.skill.skilful),
            };
          }),
          lines: probabilityLines(config, ind.id, t.tier)
            .map((l) => {
              const covered = l.leads.length === 0 ? [1, n] : [Math.min(...l.leads), Math.min(Math.max(...l.leads), n)];
              return { probability: l.probability, rank: l.rank, first: covered[0], last: covered[1] };
            })
            .filter((l) => l.first <= n),
        };
      });
    const hazard = words.hazard(ind.id);
    return {
      key: toToken(`${outcome.region.id}-${ind.id}`),
      indicator: ind.id,
      indicatorName: hazard,
      locale,
      title: words.title(outcome.region.name, hazard),
      description: words.description(outcome.region.name, hazard, panels),
      yLabel: words.yLabel,
      legend: words.legend,
      stages,
      panels,
    };
  });
}
