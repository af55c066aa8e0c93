/**
 * Turns the validated raw YAML tree (`raw-tree.ts`: kebab-case keys, relative paths) into the `Config` shape of
 * types.ts: camelCase, absolute paths, thresholds in the indicator's canonical units, defaults filled in.
 * Only called when schema and semantic checks found no problem, so shapes are trusted here.
 */
import { dirname, resolve } from 'node:path';
import type { RawThreshold, RawTree } from './raw-tree.ts';
import { thresholdUnits } from './threshold-units.ts';
import { unwrapRing } from './boundaries/geometry.ts';
import { entryDefaults } from './boundaries/region-sets.ts';
import { defaultTrendClimate } from '../indicators/registry.ts';
import {
  DEFAULT_LOOKBACK_DAYS,
  type Config,
  type IndicatorConfig,
  type IndicatorKind,
  type RegionConfig,
  type RegionShape,
  type RegionValueConfig,
  type ThresholdSpec,
} from './types.ts';
import type { DecisionConfig, TriggerRule } from './decision-config.ts';
import type { SmtpConfig } from './service-config.ts';

/** Runs a missing tier's last stage is held by default (escalation.hold-missing-runs). */
export const DEFAULT_HOLD_MISSING_RUNS = 2;
/** Debian's Chromium (package `chromium`), used for PDFs when `delivery.pdf-chromium` is not given. */
export const DEFAULT_CHROMIUM = '/usr/bin/chromium';

const camel = (k: string) => k.replace(/-([a-z0-9])/g, (_, c: string) => c.toUpperCase());

/** YAML `params:` (kebab-case keys) as the indicator kinds read them (camelCase keys). */
export function paramsFromYaml(params: Readonly<Record<string, unknown>>): Record<string, unknown> {
  return Object.fromEntries(Object.entries(params).map(([k, v]) => [camel(k), v]));
}

function toThreshold(t: RawThreshold, kind: IndicatorKind, share: boolean): ThresholdSpec {
  if (t.percentile !== undefined) return { kind: 'percentile', percentile: t.percentile };
  const family = thresholdUnits(kind, share);
  // The schema requires value and units of an absolute threshold, and check-values.ts the units among the family's.
  return { kind: 'absolute', value: family.accepted[t.units as string](t.value as number), units: family.canonical };
}

function toShape(r: RawTree['regions'][number]): RegionShape {
  if (r.box) return { kind: 'box', ...r.box };
  return { kind: 'polygon', ring: unwrapRing((r.polygon ?? []).map(([lon, lat]) => [lon, lat] as const)) };
}

/** Inline regions as written; a boundary-file entry as the regions loaded from it (`sets`). */
function toRegions(raw: RawTree, sets: ReadonlyMap<number, readonly RegionConfig[]>): RegionConfig[] {
  return raw.regions.flatMap(
    (r, i) => sets.get(i) ?? [{ id: r.id, name: r.name, shape: toShape(r), teams: r.teams, ...entryDefaults(r, raw.schedule.timezone) }],
  );
}

function toRegionValue(v: NonNullable<RawTree['indicators'][number]['region-value']>): RegionValueConfig {
  return { weights: v.weights ?? 'area', ...(v['share-above'] !== undefined ? { shareAbove: v['share-above'] } : {}) };
}

/** The schema has checked `params` against the kind's params schema, so kind and params belong together. */
function toIndicator(i: RawTree['indicators'][number]): IndicatorConfig {
  const share = i['region-value']?.['share-above'] !== undefined;
  return {
    id: i.id,
    name: i.name,
    kind: i.kind,
    windowDays: i['window-days'] ?? 1,
    threshold: toThreshold(i.threshold, i.kind, share),
    regionThresholds: Object.fromEntries(Object.entries(i['region-thresholds'] ?? {}).map(([r, t]) => [r, toThreshold(t, i.kind, share)])),
    aggregate: i.aggregate,
    tiers: i.tiers,
    ...(i['region-value'] ? { regionValue: toRegionValue(i['region-value']) } : {}),
    trendClimate: i['trend-climate'] ?? defaultTrendClimate(i.kind),
    params: paramsFromYaml(i.params ?? {}),
  } as IndicatorConfig;
}

function toRule(r: RawTree['trigger-rules'][number]): TriggerRule {
  const base = { id: r.id, indicator: r.indicator, tier: r.tier, leads: r.leads ?? [], stage: r.stage };
  return r['cost-loss'] !== undefined ? { ...base, costLoss: r['cost-loss'] } : { ...base, probability: r.probability };
}

function toSmtp(s: NonNullable<RawTree['delivery']['smtp']>): SmtpConfig {
  return {
    host: s.host,
    port: s.port,
    security: s.security,
    ...(s.user !== undefined ? { user: s.user } : {}),
    ...(s['password-env'] !== undefined ? { passwordEnv: s['password-env'] } : {}),
    timeoutSeconds: s['timeout-seconds'] ?? 30,
  };
}

/** `file` is the absolute path of the main YAML file; relative paths resolve against its directory. */
/** Defaults of the skill gate: pool the days of a lead week; weeks and months lead by lead. */
export const SKILL_GATE_DEFAULTS = {
  floor: 0,
  minEvents: 5,
  poolLeads: { days: 7, weeks: 1, months: 1 },
  resamples: 1000,
  seed: 1,
} as const;

function skillGate(g: RawTree['escalation']['skill-gate']): DecisionConfig['skillGate'] {
  const d = SKILL_GATE_DEFAULTS;
  return {
    floor: g.floor ?? d.floor,
    minEvents: g['min-events'] ?? d.minEvents,
    poolLeads: { ...d.poolLeads, ...g['pool-leads'] },
    resamples: g.resamples ?? d.resamples,
    seed: g.seed ?? d.seed,
    action: g.action,
  };
}

export function buildConfig(rawTree: unknown, file: string, sets: ReadonlyMap<number, readonly RegionConfig[]> = new Map()): Config {
  const raw = rawTree as RawTree;
  const dir = dirname(file);
  const path = (p: string) => resolve(dir, p);
  const e = raw.escalation;
  const d = raw.delivery;
  const words = raw['probability-words'];
  return {
    file,
    country: typeof raw.country === 'string' ? raw.country : (raw.country.en ?? Object.values(raw.country)[0]),
    countryNames: typeof raw.country === 'string' ? {} : raw.country,
    sources: raw.sources.map((s) => ({
      id: s.id,
      name: s.name,
      tier: s.tier,
      forecast: (Array.isArray(s['forecast-files']) ? s['forecast-files'] : [s['forecast-files']]).map(path),
      ...(s['hindcast-files'] !== undefined ? { hindcast: path(s['hindcast-files']) } : {}),
      variables: s.variables,
      priority: s.priority,
      lookbackDays: s['look-back-days'] ?? DEFAULT_LOOKBACK_DAYS[s.tier],
    })),
    observations: raw.observations ? { path: path(raw.observations.file), variables: raw.observations.variables } : null,
    population: raw.population
      ? {
          file: path(raw.population.file),
          values: raw.population.values ?? 'people-per-pixel',
          ...(raw.population.variable !== undefined ? { variable: raw.population.variable } : {}),
        }
      : null,
    regions: toRegions(raw, sets),
    teams: raw.teams.map((t) => ({ id: t.id, name: t.name, locale: t.locale, recipients: t.recipients, national: t.national ?? false })),
    indicators: raw.indicators.map(toIndicator),
    stages: raw['stage-ladder'].map((s) => ({
      id: s.id,
      label: s.label,
      colour: s.colour,
      glyph: s.glyph,
      meaning: s.meaning,
      actions: s.actions,
      cap: s.cap,
    })),
    rules: raw['trigger-rules'].map(toRule),
    decision: {
      tierCaps: e['tier-caps'],
      escalateAfterRuns: e['escalate-after-runs'],
      relaxAfterRuns: e['relax-after-runs'],
      holdMissingRuns: e['hold-missing-runs'] ?? DEFAULT_HOLD_MISSING_RUNS,
      topStageImmediate: e['top-stage-immediate'],
      combine: e.combine,
      skillGate: skillGate(e['skill-gate']),
    },
    calibration: {
      windowDays: raw.calibration['window-days'],
      minHindcastYears: raw.calibration['min-hindcast-years'],
      minMembers: raw.calibration['min-members'],
      cacheDir: path(raw.calibration['cache-dir']),
    },
    schedule: {
      cron: raw.schedule.cron,
      timezone: raw.schedule.timezone,
      waitForDataMinutes: raw.schedule['wait-for-data-minutes'],
      pollSeconds: raw.schedule['poll-seconds'],
    },
    delivery: {
      from: d.from,
      smtp: d.smtp ? toSmtp(d.smtp) : null,
      outbox: path(d.outbox),
      archive: path(d.archive),
      operators: d.operators,
      retries: d.retries,
      retryBaseSeconds: d['retry-base-seconds'],
      pdfChromium: d['pdf-chromium'] === undefined ? DEFAULT_CHROMIUM : d['pdf-chromium'],
    },
    cautions: raw.cautions,
    // The last band has no bound in YAML: it covers everything up to and including 1.
    probabilityWords: words.map((w, i) => ({
      below: i === words.length - 1 ? Number.POSITIVE_INFINITY : (w.below as number), // the schema requires it on every band but the last
      words: Object.fromEntries(Object.entries(w).filter(([k]) => k !== 'below')) as Record<string, string>,
    })),
    // A PostgreSQL URL is kept as written; a SQLite file is relative to this file.
    ledger: /^postgres(ql)?:\/\//i.test(raw.ledger) ? raw.ledger : path(raw.ledger),
    ...(raw['ledger-password-env'] !== undefined ? { ledgerPasswordEnv: raw['ledger-password-env'] } : {}),
    templates: path(raw.templates),
  };
}
