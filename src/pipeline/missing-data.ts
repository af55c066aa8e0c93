/**
 * Why a region × indicator × tier has no usable data this run, in words a bulletin can print ("no short-range
 * forecast could be used this time: <reason>"): its tier's source had no usable file (each file's problem), the
 * region has no cells or no values in the file used, or the indicator could not be computed. Keys are
 * trackKey(region, indicator, tier), the decide stage's `unavailable` input; the diagnostics' places say which.
 */
import { basename } from 'node:path';
import type { Config } from '../config/types.ts';
import type { Diagnostic } from '../core/diagnostics.ts';
import { trackKey } from '../core/keys.ts';
import type { Tier } from '../types.ts';
import type { Analysis } from './analyse.ts';

/** A diagnostic as one short clause: the file's base name and the message, without the fix. */
export function problemClause(d: Diagnostic): string {
  return `${d.place.file ? `${basename(d.place.file)}: ` : ''}${d.message}`;
}

type MissingDataConfig = Pick<Config, 'sources' | 'regions' | 'indicators'>;

/** The decide stage's missing-data inputs: which tiers a source serves, and why each region × indicator × tier lacks data. */
export function missingData(config: MissingDataConfig, analysis: Analysis): { unavailable: Map<string, string>; expectedTiers: Set<Tier> } {
  return { unavailable: unavailableReasons(config, analysis), expectedTiers: new Set(config.sources.map((s) => s.tier)) };
}

export function unavailableReasons(config: MissingDataConfig, analysis: Analysis): Map<string, string> {
  const out = new Map<string, string>();
  const put = (tier: Tier, region: string, reason: string, indicator?: string) => {
    for (const ind of config.indicators) {
      if (!ind.tiers.includes(tier) || (indicator !== undefined && ind.id !== indicator)) continue;
      const key = trackKey(region, ind.id, tier);
      if (!out.has(key)) out.set(key, reason);
    }
  };
  const problems = analysis.problems;
  for (const input of analysis.inputs) {
    const read = analysis.read.sources.find((r) => r.source.id === input.source.id);
    if (!read) {
      const own = problems.filter(
        (d) =>
          d.code !== 'forecast-missing' &&
          input.candidates.some((c) => [...c.files.existing, ...c.files.missing.map((m) => m.file)].includes(d.place.file ?? '')),
      );
      const reason =
        own.length > 0
          ? own.map(problemClause).join('; ')
          : `no ${input.source.name} file on or before the issue date (looked back ${input.source.lookbackDays} days)`;
      for (const region of config.regions) put(input.source.tier, region.id, reason);
      continue;
    }
    for (const region of config.regions) {
      if (read.series.has(region.id)) continue;
      const own = problems.find(
        (d) => read.files.includes(d.place.file ?? '') && (d.place.region === region.id || d.message.includes(`'${region.id}'`)),
      );
      put(input.source.tier, region.id, own ? problemClause(own) : `${basename(read.path)} has no grid cell or no value in this region`);
    }
  }
  for (const d of problems) {
    const source = config.sources.find((s) => s.id === d.place.source);
    if (d.code === 'indicator-skipped' || (source && d.place.region && d.place.indicator)) {
      if (source && d.place.region && d.place.indicator) put(source.tier, d.place.region, problemClause(d), d.place.indicator);
    }
  }
  return out;
}
