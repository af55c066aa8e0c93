/**
 * The skill gate: may a lead raise a stage? Scores of a single lead rest on 2–3 events when 20 hindcast years
 * verify a 90th-percentile event, so the gate judges a window of neighbouring leads together
 * (`skillGate.poolLeads`: consecutive blocks of that many leads, e.g. days 1–7, 8–14) and passes only when
 *   - the cases were verified against observations (a perfect-model estimate never passes by itself),
 *   - the window holds at least `minEvents` observed events, and
 *   - the lower end of the 90 % year-block bootstrap interval of the fair Brier skill score (Ferro 2014)
 *     is above `floor` (default 0: better than the observed normal-year frequency).
 * With no skill the lower bound exceeds 0 in about 5 % of windows (the one-sided level of a 90 % interval);
 * test/calibrate/skill-gate.test.ts simulates this.
 */
import type { DecisionConfig } from '../config/decision-config.ts';
import type { LeadWindow, Tier } from '../types.ts';
import type { SkillGateResult } from '../probability-types.ts';
import { concatCases, yearBlockBootstrap, type VerificationCases } from './bootstrap.ts';
import { fairBrierSkillScore } from './fair-brier.ts';

export type SkillGate = DecisionConfig['skillGate'];

/** First and last lead index (1-based) of the pooling window holding lead `index`. */
export function poolingWindow(tier: Tier, index: number, gate: SkillGate): { first: number; last: number } {
  const size = Math.max(1, gate.poolLeads[tier]);
  const first = Math.floor((index - 1) / size) * size + 1;
  return { first, last: first + size - 1 };
}

function windowLabel(tier: Tier, first: number, last: number): string {
  const unit = tier.slice(0, -1);
  return first === last ? `${unit} ${first}` : `${tier} ${first}–${last}`;
}

export interface LeadCases {
  readonly lead: LeadWindow;
  readonly basis: 'observed' | 'potential';
  readonly cases: VerificationCases;
}

function countEvents(c: VerificationCases): number {
  let e = 0;
  for (let k = 0; k < c.o.length; k++) e += c.o[k];
  return e;
}

const fmt = (v: number): string => (Number.isFinite(v) ? v.toFixed(2) : 'n/a');

/** Gate result of the window holding each lead, keyed by lead index. Leads of one window share one result. */
export function gateByLead(leads: readonly LeadCases[], gate: SkillGate): Map<number, SkillGateResult> {
  const out = new Map<number, SkillGateResult>();
  const windows = new Map<number, LeadCases[]>();
  for (const lc of leads) {
    const { first } = poolingWindow(lc.lead.tier, lc.lead.index, gate);
    windows.set(first, [...(windows.get(first) ?? []), lc]);
  }
  for (const members of windows.values()) {
    const observed = members.filter((m) => m.basis === 'observed');
    const { first, last } = poolingWindow(members[0].lead.tier, members[0].lead.index, gate);
    const label = windowLabel(members[0].lead.tier, first, last);
    const pooled = concatCases(observed.map((m) => m.cases));
    const events = countEvents(pooled);
    const score = observed.length > 0 ? fairBrierSkillScore(pooled.p, pooled.members, pooled.o) : Number.NaN;
    const ci =
      observed.length > 0
        ? yearBlockBootstrap(pooled, { resamples: gate.resamples, seed: gate.seed }).fairBrierSkillScore
        : { low: Number.NaN, high: Number.NaN };
    const base = { leads: label, events, years: pooled.years.length, fairBrierSkillScore: score, low: ci.low, high: ci.high };
    for (const m of members) {
      let result: SkillGateResult;
      if (m.basis === 'potential') {
        result = {
          ...base,
          passed: false,
          reason: 'potential-only',
          text: `${label}: perfect-model estimate only (no observations); it cannot raise a stage`,
        };
      } else if (events < gate.minEvents) {
        result = {
          ...base,
          passed: false,
          reason: 'few-events',
          text: `${label}: only ${events} observed events in ${base.years} years (at least ${gate.minEvents} needed to judge skill)`,
        };
      } else if (!(ci.low > gate.floor)) {
        result = {
          ...base,
          passed: false,
          reason: 'not-shown',
          text: `${label}: fair Brier skill score ${fmt(score)}, 90 % interval ${fmt(ci.low)} to ${fmt(ci.high)} does not lie above ${gate.floor} (${events} events in ${base.years} years)`,
        };
      } else {
        result = {
          ...base,
          passed: true,
          reason: 'shown',
          text: `${label}: fair Brier skill score ${fmt(score)}, 90 % interval ${fmt(ci.low)} to ${fmt(ci.high)} above ${gate.floor} (${events} events in ${base.years} years)`,
        };
      }
      out.set(m.lead.index, result);
    }
  }
  return out;
}
