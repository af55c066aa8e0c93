/**
 * Local-day reduction. Expected values are worked by hand from the interval rules in src/read/daily.ts
 * (no published source; the cell-first order is that of CDO's daymax then fldmean, checked in extract-cdo.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { regionClock } from '../../src/core/local-clock.ts';
import { planLocalDays, reduceToDays, stepIntervals, deaccumulateInPlace, type DayPlan } from '../../src/read/daily.ts';
import { chunkStarts, MAX_CHUNK_VALUES } from '../../src/read/extract-reduce.ts';

const whole = (plan: DayPlan) => ({ firstStep: 0, firstDay: 0, days: plan.days.length });

const H = 3_600_000;
const REF = Date.UTC(2026, 10, 23);
const stamps = (hours: number[]): Float64Array => Float64Array.from(hours, (h) => REF + h * H);

const fixed = (utcOffsetHours: number) => regionClock({ utcOffsetHours });

describe('stepIntervals + planLocalDays', () => {
  it('a 6-h maximum stamped at its end belongs to the period it covers: the 24Z stamp is day 1, not day 2', () => {
    const iv = stepIntervals({
      stampsMs: stamps([6, 12, 18, 24, 30, 36, 42, 48]),
      boundsMs: null,
      referenceMs: REF,
      periodEndingAtStamp: true,
      accumulated: false,
    });
    const plan = planLocalDays(iv, fixed(0));
    expect(plan.days).toEqual(['2026-11-23', '2026-11-24']);
    expect(Array.from(plan.dayOfStep)).toEqual([0, 0, 0, 0, 1, 1, 1, 1]);
    const values = Float64Array.of(1, 2, 3, 40, 5, 6, 7, 8);
    const out = new Float64Array(2);
    reduceToDays(values, 1, plan, 'max', out, whole(plan));
    expect(Array.from(out)).toEqual([40, 8]);
  });

  it('time_bnds are honoured over the stamp (stamps at the start of each 6-h bound)', () => {
    const s = stamps([0, 6, 12, 18, 24]);
    const b = Float64Array.from([0, 6, 6, 12, 12, 18, 18, 24, 24, 30], (h) => REF + h * H);
    const plan = planLocalDays(
      stepIntervals({ stampsMs: s, boundsMs: b, referenceMs: null, periodEndingAtStamp: false, accumulated: false }),
      fixed(0),
    );
    expect(plan.days).toEqual(['2026-11-23']);
    expect(Array.from(plan.dayOfStep)).toEqual([0, 0, 0, 0, -1]);
  });

  it('instantaneous 6-hourly samples, UTC+1: 00-18Z form the local day; the lone last sample is an incomplete day, dropped', () => {
    const plan = planLocalDays(
      stepIntervals({
        stampsMs: stamps([0, 6, 12, 18, 24, 30, 36, 42, 48]),
        boundsMs: null,
        referenceMs: REF,
        periodEndingAtStamp: false,
        accumulated: false,
      }),
      fixed(1),
    );
    expect(plan.days).toEqual(['2026-11-23', '2026-11-24']);
    expect(Array.from(plan.dayOfStep)).toEqual([0, 0, 0, 0, 1, 1, 1, 1, -1]);
  });

  it('UTC-3: the 00Z sample falls on the previous local evening; incomplete first local day dropped', () => {
    const plan = planLocalDays(
      stepIntervals({
        stampsMs: stamps([0, 6, 12, 18, 24, 30]),
        boundsMs: null,
        referenceMs: REF,
        periodEndingAtStamp: false,
        accumulated: false,
      }),
      fixed(-3),
    );
    expect(plan.days).toEqual(['2026-11-23']);
    expect(Array.from(plan.dayOfStep)).toEqual([-1, 0, 0, 0, 0, -1]);
  });

  it('daily maxima with a step 0 at the reference time: step 0 is no day, the 24-h stamp is day 1 (GRIB step semantics, DECISIONS.md); without any reference time a daily value keeps its stamp date (common practice, no source)', () => {
    const plan = planLocalDays(
      stepIntervals({ stampsMs: stamps([0, 24, 48]), boundsMs: null, referenceMs: REF, periodEndingAtStamp: true, accumulated: false }),
      fixed(1),
    );
    expect(plan.days).toEqual(['2026-11-23', '2026-11-24']);
    expect(Array.from(plan.dayOfStep)).toEqual([-1, 0, 1]);
    const noRef = planLocalDays(
      stepIntervals({ stampsMs: stamps([24, 48]), boundsMs: null, referenceMs: null, periodEndingAtStamp: true, accumulated: false }),
      fixed(1),
    );
    expect(noRef.days).toEqual(['2026-11-24', '2026-11-25']);
  });

  it('daily accumulation with a step 0 at the reference time: the zero-length first step is no day of its own', () => {
    const plan = planLocalDays(
      stepIntervals({ stampsMs: stamps([0, 24, 48]), boundsMs: null, referenceMs: REF, periodEndingAtStamp: true, accumulated: true }),
      fixed(1),
    );
    expect(plan.days).toEqual(['2026-11-23', '2026-11-24']);
    expect(Array.from(plan.dayOfStep)).toEqual([-1, 0, 1]);
  });

  it('daily maxima stamped 24 h, 48 h … after the reference time belong to the day before the stamp', () => {
    const plan = planLocalDays(
      stepIntervals({ stampsMs: stamps([24, 48, 72]), boundsMs: null, referenceMs: REF, periodEndingAtStamp: true, accumulated: false }),
      fixed(1),
    );
    expect(plan.days).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
  });

  it('cell_methods (interval: 24 hours) on a single step at lead 48 h: its period is the day before the stamp, not the 48 h since the reference (CF 1.11 §7.3.2)', () => {
    const iv = stepIntervals({
      stampsMs: stamps([48]),
      boundsMs: null,
      referenceMs: REF,
      periodEndingAtStamp: true,
      periodMs: 24 * H,
      accumulated: false,
    });
    expect((iv.startMs[0] - REF) / H).toBe(24);
    expect(planLocalDays(iv, fixed(0)).days).toEqual(['2026-11-24']);
  });

  it('an interval shorter than the spacing (hourly sampling of a daily maximum, CF §7.3.2) leaves the period at the spacing', () => {
    const iv = stepIntervals({
      stampsMs: stamps([24, 48, 72]),
      boundsMs: null,
      referenceMs: REF,
      periodEndingAtStamp: true,
      periodMs: H,
      accumulated: false,
    });
    expect(Array.from(iv.startMs, (v) => (v - REF) / H)).toEqual([0, 24, 48]);
  });

  it('accumulated with no step before lead 48 h: the first amount covers the reference time to 48 h', () => {
    const iv = stepIntervals({
      stampsMs: stamps([48, 72]),
      boundsMs: null,
      referenceMs: REF,
      periodEndingAtStamp: true,
      accumulated: true,
    });
    expect(Array.from(iv.startMs, (v) => (v - REF) / H)).toEqual([0, 48]);
  });

  it('mean weights steps by interval length; a missing step makes the cell-day NaN', () => {
    const plan = planLocalDays(
      stepIntervals({ stampsMs: stamps([6, 12, 18, 24]), boundsMs: null, referenceMs: REF, periodEndingAtStamp: true, accumulated: false }),
      fixed(0),
    );
    const values = Float64Array.of(1, 10, 2, 20, 3, NaN, 4, 40);
    const out = new Float64Array(2);
    reduceToDays(values, 2, plan, 'mean', out, whole(plan));
    expect(out[0]).toBeCloseTo(2.5, 12);
    expect(out[1]).toBeNaN();
  });
});

describe('accumulated fields', () => {
  it('de-accumulation with acc(t0) = 0 (checks.json conv-pr-1..3: 0→12.5 mm, 12.5→30 mm, 30→30 mm)', () => {
    const acc = Float64Array.of(12.5, 30, 30);
    deaccumulateInPlace(acc, 1, new Float64Array(1));
    expect(Array.from(acc)).toEqual([12.5, 17.5, 0]);
  });

  it('de-accumulation in time chunks carries the last accumulation over (same result as one pass, 2 cells)', () => {
    const carry = new Float64Array(2);
    const a = Float64Array.of(1, 10, 3, 30);
    const b = Float64Array.of(6, 60, 6, 70);
    deaccumulateInPlace(a, 2, carry);
    deaccumulateInPlace(b, 2, carry);
    expect([...a, ...b]).toEqual([1, 10, 2, 20, 3, 30, 0, 10]);
  });

  it('accumulated 6-hourly steps are split into intervals since the previous step; step 0 (zero length) is dropped', () => {
    const iv = stepIntervals({
      stampsMs: stamps([0, 6, 12, 18, 24]),
      boundsMs: null,
      referenceMs: REF,
      periodEndingAtStamp: true,
      accumulated: true,
    });
    expect(Array.from(iv.startMs, (v) => (v - REF) / H)).toEqual([0, 0, 6, 12, 18]);
    const plan = planLocalDays(iv, fixed(0));
    expect(Array.from(plan.dayOfStep)).toEqual([-1, 0, 0, 0, 0]);
  });
});

describe('time chunks', () => {
  it('never split a local day, and stay under MAX_CHUNK_VALUES band values', () => {
    const plan = planLocalDays(
      stepIntervals({
        stampsMs: stamps([6, 12, 18, 24, 30, 36, 42, 48, 54, 60, 66, 72]),
        boundsMs: null,
        referenceMs: REF,
        periodEndingAtStamp: true,
        accumulated: false,
      }),
      fixed(1),
    );
    expect(chunkStarts(12, MAX_CHUNK_VALUES / 3, [plan])).toEqual([0, 4, 8, 12]);
    expect(chunkStarts(12, MAX_CHUNK_VALUES / 5, [plan])).toEqual([0, 8, 12]);
    expect(chunkStarts(12, 1, [plan])).toEqual([0, 12]);
  });

  it('a day reduced from a later chunk lands in its own row (window.firstStep / firstDay)', () => {
    const plan = planLocalDays(
      stepIntervals({
        stampsMs: stamps([6, 12, 18, 24, 30, 36, 42, 48]),
        boundsMs: null,
        referenceMs: REF,
        periodEndingAtStamp: true,
        accumulated: false,
      }),
      fixed(0),
    );
    const out = new Float64Array(1);
    reduceToDays(Float64Array.of(5, 9, 7, 1), 1, plan, 'sum', out, { firstStep: 4, firstDay: 1, days: 1 });
    expect(out[0]).toBe(22);
  });
});
