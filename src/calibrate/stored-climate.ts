/**
 * The model climates of one source as the skill cache stores them (JSON): lead values as plain arrays, and the
 * JSON Schema an entry read back must match before it is used (skill-cache.ts checks it on the stored form, where
 * non-finite numbers are still {"$num": …}).
 */
import { jsonShape } from '../core/json-shape.ts';
import { TIERS } from '../types.ts';
import type { LeadClimate } from './climate.ts';
import type { IndicatorClimate } from './model-climate.ts';

export type StoredClimate = Omit<IndicatorClimate, 'hindcast' | 'observed'> & {
  region: string;
  indicator: string;
  hindcast: StoredLeadClimate | null;
  observed: StoredLeadClimate | null;
};
type StoredLeadClimate = Omit<LeadClimate, 'values'> & { values: number[] };

/** A number as stored: finite, or {"$num": "NaN" | "Infinity" | "-Infinity"}. */
const num = {
  anyOf: [
    { type: 'number' },
    {
      type: 'object',
      properties: { $num: { enum: ['NaN', 'Infinity', '-Infinity'] } },
      required: ['$num'],
      additionalProperties: false,
    },
  ],
};
const storedLeadClimate = {
  anyOf: [
    { type: 'null' },
    {
      type: 'object',
      properties: {
        years: { type: 'array', items: { type: 'integer' } },
        members: { type: 'integer', minimum: 1 },
        leads: {
          type: 'array',
          items: {
            type: 'object',
            properties: {
              tier: { enum: TIERS },
              index: { type: 'integer' },
              start: { type: 'string' },
              end: { type: 'string' },
              modelMonth: { type: 'string' },
            },
            required: ['tier', 'index', 'start', 'end'],
          },
        },
        units: { type: 'string' },
        values: { type: 'array', items: num },
        recentreOn: { type: 'integer' },
      },
      required: ['years', 'members', 'leads', 'units', 'values'],
    },
  ],
};
/** The stored model climates; a skill report and a diagnostic are checked for their identifying fields. */
export const isStoredClimates = jsonShape<unknown>({
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
});

export const toStored = (c: LeadClimate | null): StoredLeadClimate | null => (c ? { ...c, values: Array.from(c.values) } : null);
export const fromStored = (c: StoredLeadClimate | null): LeadClimate | null => (c ? { ...c, values: Float64Array.from(c.values) } : null);
