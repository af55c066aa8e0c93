/**
 * The operator YAML as the schema (`config/forelight.schema.json`) describes it, once schema and semantic checks passed:
 * kebab-case keys, relative paths, texts per locale. `build-config.ts` turns it into `Config`.
 */
import type { Quantity, Tier } from '../types.ts';
import type { IndicatorKind } from './types.ts';
import type { StageConfig } from './decision-config.ts';
import type { SmtpConfig } from './service-config.ts';

type Texts = Record<string, string>;
export interface RawThreshold {
  percentile?: number;
  value?: number;
  units?: string;
}
export interface RawTree {
  country: string | Texts;
  sources: {
    id: string;
    name: string;
    tier: Tier;
    'forecast-files': string | string[];
    'hindcast-files'?: string;
    variables: Partial<Record<Quantity, string>>;
    priority: number;
    'look-back-days'?: number;
  }[];
  observations?: { file: string; variables: Partial<Record<Quantity, string>> } | null;
  population?: { file: string; variable?: string; values?: 'people-per-pixel' | 'people-per-km2' } | null;
  regions: ({
    id: string;
    name: string;
    box?: { south: number; north: number; west: number; east: number };
    polygon?: [number, number][];
    teams: string[];
  } & Record<string, unknown>)[];
  teams: { id: string; name: string; locale: string; recipients: string[]; national?: boolean }[];
  indicators: {
    id: string;
    name: string;
    kind: IndicatorKind;
    'window-days'?: number;
    threshold: RawThreshold;
    'region-thresholds'?: Record<string, RawThreshold>;
    aggregate: 'mean' | 'max' | 'sum';
    'region-value'?: { weights?: 'area' | 'population'; 'share-above'?: number };
    tiers: Tier[];
    'trend-climate'?: boolean;
    params?: Record<string, number | string | boolean>;
  }[];
  'stage-ladder': {
    id: string;
    label: Texts;
    glyph: string;
    colour: string;
    meaning: Texts;
    actions: Record<string, Texts>;
    cap: StageConfig['cap'];
  }[];
  'trigger-rules': {
    id: string;
    indicator: string;
    tier: Tier;
    leads?: number[];
    stage: string;
    probability?: number;
    'cost-loss'?: number;
  }[];
  escalation: {
    'tier-caps': Partial<Record<Tier, string>>;
    'escalate-after-runs': number;
    'relax-after-runs': number;
    'hold-missing-runs'?: number;
    'top-stage-immediate': boolean;
    combine: 'highest' | { matrix: { rows: string[]; columns: string[]; table: string[][] } };
    'skill-gate': {
      floor?: number;
      'min-events'?: number;
      'pool-leads'?: Partial<Record<Tier, number>>;
      resamples?: number;
      seed?: number;
      action: 'withhold' | 'say-no-skill';
    };
  };
  calibration: { 'window-days': number; 'min-hindcast-years': number; 'min-members': number; 'cache-dir': string };
  schedule: { cron: string; timezone: string; 'wait-for-data-minutes': number; 'poll-seconds': number };
  delivery: {
    from: string;
    smtp: {
      host: string;
      port: number;
      security: SmtpConfig['security'];
      user?: string;
      'password-env'?: string;
      'timeout-seconds'?: number;
    } | null;
    outbox: string;
    archive: string;
    operators: string[];
    retries: number;
    'retry-base-seconds': number;
    'pdf-chromium'?: string | null;
  };
  cautions: Record<string, string[]>;
  'probability-words': ({ below?: number } & Record<string, string | number>)[];
  ledger: string;
  'ledger-password-env'?: string;
  templates: string;
}
