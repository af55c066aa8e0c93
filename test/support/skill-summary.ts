/**
 * Skill summaries for decide/render tests, consistent with the skill gate's rule (calibrate/skill-gate.ts):
 * skilful only when observed, with at least 5 events, and the lower end of the fair-BSS interval above 0.
 * Invented figures (no source): `low` is the interval's lower end, the score sits 0.15 above it.
 */
import type { SkillSummary } from '../../src/probability-types.ts';

export function skillSummary(
  low: number,
  opts: { basis?: SkillSummary['basis']; events?: number; years?: number; leads?: string } = {},
): SkillSummary {
  const basis = opts.basis ?? 'observed';
  const events = opts.events ?? 12;
  const years = opts.years ?? 20;
  const score = Math.round((low + 0.15) * 100) / 100;
  const leads = opts.leads ?? 'week 2';
  const passed = basis === 'observed' && events >= 5 && low > 0;
  const reason = basis === 'potential' ? 'potential-only' : events < 5 ? 'few-events' : passed ? 'shown' : 'not-shown';
  const text =
    basis === 'potential'
      ? `${leads}: perfect-model estimate only (no observations); it cannot raise a stage`
      : `${leads}: fair Brier skill score ${score.toFixed(2)}, 90 % interval ${low.toFixed(2)} to ${(score + 0.15).toFixed(2)} ${passed ? 'above' : 'does not lie above'} 0 (${events} events in ${years} years)`;
  return {
    brierScore: 0.08,
    brierSkillScore: score - 0.02,
    fairBrierSkillScore: score,
    rocArea: 0.8,
    basis,
    cases: years,
    years,
    events,
    gate: {
      leads,
      events: basis === 'observed' ? events : 0,
      years: basis === 'observed' ? years : 0,
      fairBrierSkillScore: basis === 'observed' ? score : Number.NaN,
      low: basis === 'observed' ? low : Number.NaN,
      high: basis === 'observed' ? score + 0.15 : Number.NaN,
      passed,
      reason,
      text,
    },
    reliability: null,
    skilful: passed,
  };
}
