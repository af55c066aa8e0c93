/**
 * Reliability diagram with consistency bars, Bröcker & Smith (2007), "Increasing the reliability of reliability
 * diagrams", Weather and Forecasting 22:651-661. Forecast probabilities are binned (default 11 bins centred on
 * 0, 0.1, …, 1, i.e. edges 0.05, 0.15, …, 0.95, which keeps a 10-member ensemble's values apart); per bin the mean
 * forecast, the observed frequency and the count. Consistency bars by their consistency resampling: draw N
 * forecasts with replacement from the N forecasts, draw each outcome as Bernoulli(forecast) — a reliable forecast
 * by construction — bin again and keep, per bin, observed frequency minus mean forecast; the bar is the bin's mean
 * forecast plus the 5th and 95th percentiles (type 7) of those differences, clipped to 0..1 (a 90 % range). An
 * observed frequency outside its bar is evidence of unreliability at that probability. Seeded mulberry32.
 */
import { percentileLinear } from '../core/percentile.ts';
import type { ReliabilityBin, ReliabilityDiagram } from '../probability-types.ts';
import { mulberry32 } from './seeded-random.ts';

export type { ReliabilityBin, ReliabilityDiagram } from '../probability-types.ts';

export const DEFAULT_RELIABILITY_EDGES: readonly number[] = Array.from({ length: 10 }, (_, i) => (2 * i + 1) / 20);

function binOf(p: number, edges: readonly number[]): number {
  let k = 0;
  while (k < edges.length && p >= edges[k]) k++;
  return k;
}

/** Reliability bins of probabilities `p` (0..1) against outcomes `o` (0/1), with consistency bars. */
export function reliabilityDiagram(
  p: ArrayLike<number>,
  o: ArrayLike<number>,
  options: { readonly resamples: number; readonly seed: number; readonly edges?: readonly number[] },
): ReliabilityDiagram {
  const edges = options.edges ?? DEFAULT_RELIABILITY_EDGES;
  const nBins = edges.length + 1;
  const n = p.length;
  const count = new Float64Array(nBins);
  const sumP = new Float64Array(nBins);
  const sumO = new Float64Array(nBins);
  const bin = Int32Array.from({ length: n }, (_, i) => binOf(p[i], edges));
  for (let i = 0; i < n; i++) {
    count[bin[i]]++;
    sumP[bin[i]] += p[i];
    sumO[bin[i]] += o[i];
  }
  const diffs: number[][] = Array.from({ length: nBins }, () => []);
  const rand = mulberry32(options.seed);
  const rc = new Float64Array(nBins);
  const rp = new Float64Array(nBins);
  const ro = new Float64Array(nBins);
  for (let r = 0; r < (n > 0 ? options.resamples : 0); r++) {
    rc.fill(0);
    rp.fill(0);
    ro.fill(0);
    for (let j = 0; j < n; j++) {
      const i = Math.floor(rand() * n);
      const outcome = rand() < p[i] ? 1 : 0;
      rc[bin[i]]++;
      rp[bin[i]] += p[i];
      ro[bin[i]] += outcome;
    }
    for (let k = 0; k < nBins; k++) if (rc[k] > 0) diffs[k].push((ro[k] - rp[k]) / rc[k]);
  }
  const clip = (x: number) => Math.min(1, Math.max(0, x));
  const bins: ReliabilityBin[] = [];
  for (let k = 0; k < nBins; k++) {
    if (count[k] === 0) continue;
    const mean = sumP[k] / count[k];
    const has = diffs[k].length > 0;
    bins.push({
      low: k === 0 ? 0 : edges[k - 1],
      high: k === nBins - 1 ? 1 : edges[k],
      count: count[k],
      forecastMean: mean,
      observedFrequency: sumO[k] / count[k],
      consistencyLow: has ? clip(mean + percentileLinear(diffs[k], 5)) : NaN,
      consistencyHigh: has ? clip(mean + percentileLinear(diffs[k], 95)) : NaN,
    });
  }
  return { cases: n, resamples: options.resamples, bins };
}
