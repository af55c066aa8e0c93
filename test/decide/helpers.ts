/** A small hand-made Config and LeadProbability factory for decide tests (no files involved). */
import type { Config } from '../../src/config/types.ts';
import type { DecisionConfig, TriggerRule } from '../../src/config/decision-config.ts';
import type { Tier } from '../../src/types.ts';
import type { LeadProbability, SkillSummary } from '../../src/probability-types.ts';
import { skillSummary } from '../support/skill-summary.ts';

const text = (en: string) => ({ en, fr: en });

export const RULES: readonly TriggerRule[] = [
  { id: 'heat-weeks-mindful', indicator: 'heat', tier: 'weeks', leads: [2, 3], stage: 'mindful', probability: 0.4 },
  { id: 'heat-weeks-brace', indicator: 'heat', tier: 'weeks', leads: [2, 3], stage: 'brace', probability: 0.6 },
  { id: 'heat-days-mindful-cl', indicator: 'heat', tier: 'days', leads: [1, 2, 3, 4, 5], stage: 'mindful', costLoss: 0.2 },
  { id: 'heat-days-brace', indicator: 'heat', tier: 'days', leads: [1, 2, 3, 4, 5], stage: 'brace', probability: 0.6 },
  { id: 'heat-days-act-now', indicator: 'heat', tier: 'days', leads: [1, 2, 3, 4, 5], stage: 'act-now', probability: 0.8 },
  // Deliberately above the months cap (the loader would refuse this; decide must still cap it).
  { id: 'heat-months-brace', indicator: 'heat', tier: 'months', leads: [1, 2, 3], stage: 'brace', probability: 0.5 },
];

export function makeConfig(decision: Partial<DecisionConfig> = {}, rules: readonly TriggerRule[] = RULES): Config {
  return {
    file: '/virtual/forelight.yaml',
    country: 'Testland',
    countryNames: {},
    sources: [],
    observations: null,
    regions: [
      { id: 'r1', name: 'Region One', shape: { kind: 'box', south: 0, north: 1, west: 0, east: 1 }, utcOffsetHours: 0, teams: ['t1'] },
      { id: 'r2', name: 'Region Two', shape: { kind: 'box', south: 1, north: 2, west: 0, east: 1 }, utcOffsetHours: 0, teams: ['t1'] },
    ],
    teams: [{ id: 't1', name: 'Team', locale: 'en', recipients: ['t@team.example'], national: false }],
    indicators: [
      {
        id: 'heat',
        name: 'Heat',
        kind: 'heat-index',
        windowDays: 1,
        threshold: { kind: 'absolute', value: 39, units: 'degC' },
        regionThresholds: {},
        trendClimate: false,
        aggregate: 'max',
        tiers: ['days', 'weeks', 'months'],
        params: {},
      },
      {
        id: 'malaria',
        name: 'Malaria suitability',
        kind: 'malaria-suitability',
        windowDays: 30,
        threshold: { kind: 'absolute', value: 0.5, units: '1' },
        regionThresholds: {},
        trendClimate: false,
        aggregate: 'mean',
        tiers: ['months'],
        params: {},
      },
    ],
    stages: ['quiet', 'mindful', 'brace', 'act-now'].map((id, i) => ({
      id,
      label: text(id),
      colour: '#000000',
      glyph: ['○', '◔', '◑', '●'][i],
      meaning: text(id),
      actions: { default: text(`do ${id}`) },
      cap: { severity: 'Minor', urgency: 'Future' },
    })),
    rules,
    decision: {
      tierCaps: { months: 'mindful', weeks: 'brace' },
      escalateAfterRuns: 2,
      relaxAfterRuns: 2,
      holdMissingRuns: 2,
      topStageImmediate: true,
      combine: 'highest',
      skillGate: { floor: 0, minEvents: 5, poolLeads: { days: 7, weeks: 1, months: 1 }, resamples: 1000, seed: 1, action: 'say-no-skill' },
      ...decision,
    },
    calibration: { windowDays: 15, minHindcastYears: 10, minMembers: 10, cacheDir: '/virtual/cache' },
    schedule: { cron: '30 7 * * 1,4', timezone: 'Etc/GMT-1', waitForDataMinutes: 60, pollSeconds: 60 },
    delivery: {
      from: 'f@team.example',
      smtp: {
        host: 'mail.team.example',
        port: 587,
        security: 'starttls',
        user: 'fl',
        passwordEnv: 'FORELIGHT_TEST_SMTP_PASSWORD',
        timeoutSeconds: 30,
      },
      outbox: '/virtual/outbox',
      archive: '/virtual/archive',
      operators: [],
      retries: 0,
      retryBaseSeconds: 1,
    },
    cautions: { en: ['Forecasts can be wrong.'] },
    probabilityWords: [{ below: Number.POSITIVE_INFINITY, words: { en: 'some chance' } }],
    ledger: '/virtual/ledger.sqlite',
    templates: '/virtual/templates',
  };
}

export const skill = (low: number): SkillSummary => skillSummary(low);

/** One lead probability; skill defaults to a fair-BSS interval whose lower end is 0.1 (skilful); ≤ 0 is not. */
export function prob(
  region: string,
  tier: Tier,
  index: number,
  probability: number,
  skillLow: number | null = 0.1,
  indicator = 'heat',
): LeadProbability {
  return {
    source: tier === 'days' ? 'short' : tier === 'weeks' ? 'subseasonal' : 'seasonal',
    region,
    indicator,
    lead: { tier, index, start: `2026-12-${String(index).padStart(2, '0')}`, end: `2026-12-${String(index).padStart(2, '0')}` },
    probability,
    baseRate: 0.1,
    members: 10,
    validMembers: 10,
    threshold: { value: 39, units: 'degC', origin: 'absolute threshold from the configuration' },
    operator: '>',
    flags: [],
    skill: skillLow === null ? null : skillSummary(skillLow, { leads: `${tier.slice(0, -1)} ${index}` }),
    calibrated: true,
  };
}
