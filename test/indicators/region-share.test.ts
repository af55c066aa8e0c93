/**
 * Share of a region above a level (src/indicators/region-share.ts), on hand-worked values (common practice, no
 * source): strictly above, weights renormalised over valid cells, a day without a valid cell stays missing.
 */
import { describe, expect, it } from 'vitest';
import { shareAbove } from '../../src/indicators/region-share.ts';
import type { IndicatorSeries } from '../../src/types.ts';

const cell = (values: number[]): IndicatorSeries => ({
  region: 'r@cells',
  indicator: 'hi',
  units: 'degC',
  days: ['2026-01-01', '2026-01-02', '2026-01-03'],
  members: 1,
  data: Float64Array.from(values),
  outOfRange: 0,
  missing: values.filter(Number.isNaN).length,
});

describe('shareAbove', () => {
  it('weights 0.5/0.3/0.2: day 1 two cells above (80 %), day 2 equal to the level counts as not above (0 %)', () => {
    const s = shareAbove([cell([40, 39, NaN]), cell([41, 39, NaN]), cell([30, 38, NaN])], Float64Array.of(0.5, 0.3, 0.2), 39, 'r');
    expect(s.units).toBe('%');
    expect(s.region).toBe('r');
    expect(s.data[0]).toBeCloseTo(80, 12);
    expect(s.data[1]).toBe(0);
    expect(s.data[2]).toBeNaN(); // no valid cell: unknown, never 0 %
    expect(s.missing).toBe(1);
  });

  it('a missing cell is left out and the others renormalised: 0.3 / (0.3 + 0.2) = 60 %', () => {
    const s = shareAbove([cell([NaN, 0, 0]), cell([41, 0, 0]), cell([30, 0, 0])], Float64Array.of(0.5, 0.3, 0.2), 39, 'r');
    expect(s.data[0]).toBeCloseTo(60, 12);
  });
});
