/** Builders for invented hindcast/observation climates (Veloria sample world; no real data). */
import type { LeadClimate } from '../../src/calibrate/lead-climate.ts';
import type { LeadWindow, Tier } from '../../src/types.ts';

export function leadsOf(tier: Tier, n: number): LeadWindow[] {
  return Array.from({ length: n }, (_, i) => ({
    tier,
    index: i + 1,
    start: `2006-12-${String(i + 1).padStart(2, '0')}`,
    end: `2006-12-${String(i + 1).padStart(2, '0')}`,
  }));
}

/** A climate whose value for (year position y, member m, lead l) is f(y, m, l). */
export function climate(
  years: number[],
  members: number,
  leads: LeadWindow[],
  f: (y: number, m: number, l: number) => number,
  units = 'degC',
): LeadClimate {
  const values = new Float64Array(years.length * members * leads.length);
  for (let y = 0; y < years.length; y++)
    for (let m = 0; m < members; m++) for (let l = 0; l < leads.length; l++) values[(y * members + m) * leads.length + l] = f(y, m, l);
  return { years, members, leads, units, values };
}

export const YEARS_2006_2025 = Array.from({ length: 20 }, (_, i) => 2006 + i);
