/**
 * Reliability diagrams of the archive (one SVG per region × indicator × range): forecast probability across,
 * observed frequency up, the diagonal of perfect reliability, each bin's 90 % consistency bar (Bröcker & Smith
 * 2007, computed in calibrate/reliability.ts) as a vertical line and its observed frequency as a dot whose area
 * grows with the bin's count. The lead drawn is the one that set the stage, else the first lead verified against
 * observations, else the first with cases (a perfect-model diagram is titled so). The numbers are in run.json.
 */
import type { LeadProbability, ReliabilityDiagram } from '../probability-types.ts';
import type { Translate } from './catalogue.ts';
import type { RegionOutcome } from './model.ts';
import { escapeXml, toToken } from './safe-text.ts';

const SIZE = 300;
const PAD = 40;
const PLOT = SIZE - PAD - 12;

const x = (p: number) => PAD + p * PLOT;
const y = (f: number) => 12 + (1 - f) * PLOT;

/** SVG of one reliability diagram; `title` names region, hazard, range and lead. */
export function reliabilitySvg(d: ReliabilityDiagram, title: string, t: Translate): string {
  const ticks = [0, 0.25, 0.5, 0.75, 1]
    .map(
      (v) =>
        `<line x1="${x(v)}" y1="${y(0)}" x2="${x(v)}" y2="${y(0) + 4}" stroke="#555"/><text x="${x(v)}" y="${y(0) + 16}" font-size="11" text-anchor="middle">${v * 100}</text>` +
        `<line x1="${x(0) - 4}" y1="${y(v)}" x2="${x(0)}" y2="${y(v)}" stroke="#555"/><text x="${x(0) - 7}" y="${y(v) + 4}" font-size="11" text-anchor="end">${v * 100}</text>`,
    )
    .join('');
  const max = Math.max(1, ...d.bins.map((b) => b.count));
  const bins = d.bins
    .map((b) => {
      const bar = Number.isFinite(b.consistencyLow)
        ? `<line x1="${x(b.forecastMean)}" y1="${y(b.consistencyLow)}" x2="${x(b.forecastMean)}" y2="${y(b.consistencyHigh)}" stroke="#8c96c6" stroke-width="5" stroke-linecap="round"/>`
        : '';
      const r = 2.5 + 5 * Math.sqrt(b.count / max);
      return `${bar}<circle cx="${x(b.forecastMean)}" cy="${y(b.observedFrequency)}" r="${r.toFixed(1)}" fill="#4d004b"><title>${b.count}</title></circle>`;
    })
    .join('');
  const label = escapeXml(title);
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" width="${SIZE}" height="${SIZE}" viewBox="0 0 ${SIZE} ${SIZE}" role="img" aria-label="${label}" font-family="DejaVu Sans, sans-serif">` +
    `<title>${label}</title><rect width="${SIZE}" height="${SIZE}" fill="#ffffff"/>` +
    `<rect x="${x(0)}" y="${y(1)}" width="${PLOT}" height="${PLOT}" fill="none" stroke="#999"/>` +
    `<line x1="${x(0)}" y1="${y(0)}" x2="${x(1)}" y2="${y(1)}" stroke="#999" stroke-dasharray="4 3"/>${ticks}${bins}` +
    `<text x="${x(0.5)}" y="${SIZE - 4}" font-size="11" text-anchor="middle">${escapeXml(t('reliability.axisForecast'))}</text>` +
    `<text transform="translate(11 ${y(0.5)}) rotate(-90)" font-size="11" text-anchor="middle">${escapeXml(t('reliability.axisObserved'))}</text>` +
    `</svg>`
  );
}

function chosenLead(probabilities: readonly LeadProbability[], deciding: number | null): LeadProbability | undefined {
  const withDiagram = probabilities.filter((p) => (p.skill?.reliability?.bins.length ?? 0) > 0);
  return withDiagram.find((p) => p.lead.index === deciding) ?? withDiagram.find((p) => p.skill?.basis === 'observed') ?? withDiagram[0];
}

export interface ReliabilityChart {
  readonly filename: string;
  readonly label: string;
  readonly svg: string;
}

/** One reliability diagram per region × indicator × range that has verification cases. */
export function reliabilityCharts(
  regions: readonly RegionOutcome[],
  t: Translate,
  hazardOf: (indicatorId: string) => string,
): ReliabilityChart[] {
  return regions.flatMap((r) =>
    r.perTier.flatMap((tier): ReliabilityChart[] => {
      const p = chosenLead(tier.probabilities, tier.decision.lead?.lead.index ?? null);
      const d = p?.skill?.reliability;
      if (!p || !d) return [];
      const label = t('reliability.title', {
        region: r.region.name,
        hazard: hazardOf(tier.indicator.id),
        range: tier.tier,
        lead: p.lead.index,
        cases: d.cases,
        potential: p.skill?.basis === 'potential' ? 'yes' : 'no',
      });
      return [
        {
          filename: `reliability-${toToken(`${r.region.id}-${tier.indicator.id}-${tier.tier}`)}.svg`,
          label,
          svg: reliabilitySvg(d, label, t),
        },
      ];
    }),
  );
}
