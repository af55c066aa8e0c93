/**
 * The model climates of one source as the skill cache stores them (JSON): lead values as the base64 of their
 * little-endian IEEE 754 doubles (exact, NaN included; parsing hundreds of thousands of JSON numbers per entry cost
 * more than the rest of a warm run's calibration), and the JSON Schema an entry read back must match before it is
 * used (skill-cache.ts checks it once the other non-finite numbers, stored as {"$num": …}, are numbers again).
 */
import { jsonShape, type ShapeCheck } from '../core/json-shape.ts';
import { TIERS } from '../types.ts';
import type { LeadClimate } from './lead-climate.ts';
import type { Diagnostic } from '../core/diagnostics.ts';
import type { SkillReport } from './skill.ts';
import type { TunedTrigger } from './trigger-tuning.ts';

export interface IndicatorClimate {
  readonly hindcast: LeadClimate | null;
  readonly observed: LeadClimate | null;
  readonly skill: readonly SkillReport[];
  /** Rule id → trigger tuned for its cost/loss ratio (maximum relative economic value, judged leave-one-year-out). */
  readonly tuned: Readonly<Record<string, TunedTrigger>>;
  readonly problems: readonly Diagnostic[];
}

export type StoredClimate = Omit<IndicatorClimate, 'hindcast' | 'observed'> & {
  region: string;
  indicator: string;
  hindcast: StoredLeadClimate | null;
  observed: StoredLeadClimate | null;
};
type StoredLeadClimate = Omit<LeadClimate, 'values'> & { values: string };

/** JSON Schema of a `LeadWindow` (types.ts), as stored here and sent by cluster workers. */
export const LEAD_WINDOW_SCHEMA = {
  type: 'object',
  properties: {
    tier: { enum: TIERS },
    index: { type: 'integer' },
    start: { type: 'string' },
    end: { type: 'string' },
    modelMonth: { type: 'string' },
  },
  required: ['tier', 'index', 'start', 'end'],
};

/** A number, NaN and ±Infinity included (decoded from {"$num": …}; any other {"$num": …} stays an object and fails). */
const num = { type: 'number' };
const storedLeadClimate = {
  anyOf: [
    { type: 'null' },
    {
      type: 'object',
      properties: {
        years: { type: 'array', items: { type: 'integer' } },
        members: { type: 'integer', minimum: 1 },
        leads: { type: 'array', items: LEAD_WINDOW_SCHEMA },
        units: { type: 'string' },
        values: { type: 'string' },
        recentreOn: { type: 'integer' },
      },
      required: ['years', 'members', 'leads', 'units', 'values'],
    },
  ],
};
/** The stored model climates; a skill report and a diagnostic are checked for their identifying fields. */
const isStoredShape = jsonShape<StoredClimate[]>(
  {
    type: 'array',
    items: {
      type: 'object',
      properties: {
        region: { type: 'string' },
        indicator: { type: 'string' },
        hindcast: storedLeadClimate,
        observed: storedLeadClimate,
        skill: {
          type: 'array',
          items: {
            type: 'object',
            properties: { lead: { type: 'object' }, basis: { enum: ['observed', 'potential'] }, summary: { type: 'object' } },
            required: ['lead', 'basis', 'summary'],
          },
        },
        tuned: {
          type: 'object',
          additionalProperties: {
            type: 'object',
            properties: {
              costLoss: num,
              basis: { enum: ['observed', 'potential'] },
              hindcastMembers: { type: 'integer', minimum: 1 },
              hindcastCount: { type: 'integer', minimum: 1 },
              forecastThreshold: num,
              value: { type: 'object', properties: { value: num, inSampleValue: num, interval: { type: 'object' } } },
            },
            required: ['costLoss', 'basis', 'hindcastMembers', 'hindcastCount', 'forecastThreshold', 'value'],
          },
        },
        problems: {
          type: 'array',
          items: {
            type: 'object',
            properties: { code: { type: 'string' }, message: { type: 'string' }, hint: { type: 'string' } },
            required: ['code', 'message', 'hint'],
          },
        },
      },
      required: ['region', 'indicator', 'hindcast', 'observed', 'skill', 'tuned', 'problems'],
    },
  },
  { nonFinite: true },
);

const BYTES = 8;

/**
 * Bytes that base64 text (RFC 4648 §4: A–Z a–z 0–9 + /, 4 characters per 3 bytes, at most two '=' at the end) holds,
 * or NaN when it is not such text. A loop, not a regular expression: an entry holds megabytes of it.
 */
function base64Bytes(text: string): number {
  const pad = text.endsWith('==') ? 2 : text.endsWith('=') ? 1 : 0;
  if (text.length % 4 !== 0) return Number.NaN;
  for (let i = 0; i < text.length - pad; i++) {
    const c = text.charCodeAt(i);
    const ok = (c >= 65 && c <= 90) || (c >= 97 && c <= 122) || (c >= 48 && c <= 57) || c === 43 || c === 47;
    if (!ok) return Number.NaN;
  }
  return (text.length / 4) * 3 - pad;
}

/** Why a climate's values do not hold years × members × leads doubles, or null when they do. */
function valuesProblem(c: StoredLeadClimate | null, at: string): string | null {
  if (c === null) return null;
  const { years, members, leads, values } = c;
  const expected = years.length * members * leads.length * BYTES;
  const bytes = base64Bytes(values);
  if (bytes === expected) return null;
  const held = Number.isNaN(bytes) ? 'is not base64' : `holds ${bytes} bytes`;
  return `${at}/values ${held}, expected ${expected} bytes (${years.length} years × ${members} members × ${leads.length} leads × ${BYTES})`;
}

/** isStoredShape, and every climate's values of the size its years, members and leads give. */
export const isStoredClimates: ShapeCheck<StoredClimate[]> = (value) => {
  const shaped = isStoredShape(value);
  if (!shaped.ok) return shaped;
  const entries = shaped.value;
  for (let i = 0; i < entries.length; i++) {
    const why = valuesProblem(entries[i].hindcast, `/${i}/hindcast`) ?? valuesProblem(entries[i].observed, `/${i}/observed`);
    if (why) return { ok: false, why };
  }
  return shaped;
};

function encodeValues(values: Float64Array): string {
  const bytes = Buffer.alloc(values.length * BYTES);
  for (let i = 0; i < values.length; i++) bytes.writeDoubleLE(values[i], i * BYTES);
  return bytes.toString('base64');
}

function decodeValues(text: string): Float64Array {
  const bytes = Buffer.from(text, 'base64');
  const out = new Float64Array(bytes.length / BYTES);
  for (let i = 0; i < out.length; i++) out[i] = bytes.readDoubleLE(i * BYTES);
  return out;
}

export const toStored = (c: LeadClimate | null): StoredLeadClimate | null => (c ? { ...c, values: encodeValues(c.values) } : null);
export const fromStored = (c: StoredLeadClimate | null): LeadClimate | null => (c ? { ...c, values: decodeValues(c.values) } : null);
