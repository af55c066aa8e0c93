/**
 * A worker's answer is checked before the coordinator uses it (common practice, no source: never trust what
 * crosses a queue). The round trip through JSON keeps every bit, NaN included (IEEE 754 binary64 bytes, base64
 * per RFC 4648 §4).
 */
import { describe, expect, it } from 'vitest';
import { checkWireStart, fromWireStart, toWireStart } from '../../src/cluster/start-jobs.ts';
import { checkWire, fromWire, toWire } from '../../src/cluster/wire.ts';
import { InputError } from '../../src/core/errors.ts';
import { pairKey } from '../../src/core/keys.ts';
import type { StartOutcome } from '../../src/pipeline/hindcast-starts.ts';
import type { RegionSeries } from '../../src/types.ts';

const series: RegionSeries = {
  region: 'north',
  quantity: 'tmax',
  units: 'degC',
  days: ['2026-03-01', '2026-03-02'],
  members: 2,
  data: Float64Array.of(31.5, NaN, 32.25, -0),
  cells: 3,
  provenance: { file: 'fc.nc', variable: 'tasmax', referenceTime: '2026-03-01T00:00:00Z' },
};
const problem = new InputError('read-failed', 'south.nc', 'cannot open the file (ENOENT)', 'check the path');
const answer = () => JSON.parse(JSON.stringify(toWire({ series: [series], problems: [problem], notes: ['a note'] })));

describe('checkWire (a worker answer read back from Redis)', () => {
  it('accepts what toWire wrote, after JSON, and fromWire gives the same bits back', () => {
    const checked = checkWire(answer());
    expect(checked.ok).toBe(true);
    if (!checked.ok) return;
    const back = fromWire(checked.value);
    expect(Array.from(back.series[0].data)).toEqual([31.5, NaN, 32.25, -0]);
    expect(Object.is(back.series[0].data[3], -0)).toBe(true);
    expect(back.problems[0].diagnostic).toEqual(problem.diagnostic);
  });

  const damaged: [string, (w: ReturnType<typeof answer>) => void, RegExp][] = [
    ['series bytes cut short', (w) => (w.series[0].data = w.series[0].data.slice(0, 24)), /\/series\/0\/data does not hold 4 values/],
    ['an unknown quantity', (w) => (w.series[0].quantity = 'tmaxx'), /\/series\/0\/quantity must be equal to one of the allowed values/],
    ['a problem without a code', (w) => delete w.problems[0].diagnostic.code, /\/problems\/0\/diagnostic is not a diagnostic/],
    ['no notes', (w) => delete w.notes, /must have required property 'notes'/],
    ['not an object', () => undefined, /must be object/],
  ];
  for (const [what, damage, why] of damaged) {
    it(`refuses an answer with ${what}, saying where`, () => {
      const w = answer();
      damage(w);
      const checked = checkWire(what === 'not an object' ? 'done' : w);
      expect(checked.ok).toBe(false);
      if (!checked.ok) expect(checked.why).toMatch(why);
    });
  }
});

describe('checkWireStart (a hindcast-start answer read back from Redis)', () => {
  const leads = [
    { tier: 'days', index: 1, start: '2006-03-01', end: '2006-03-01' },
    { tier: 'days', index: 2, start: '2006-03-02', end: '2006-03-02' },
  ] as const;
  const hindcast = { leads: [...leads], members: 2, values: Float64Array.of(1, NaN, 3, 4), beyondTable: Uint8Array.of(0, 1, 0, 0) };
  const outcome: StartOutcome = {
    reduction: {
      year: 2006,
      start: '2006-03-01',
      path: 'hc_2006.nc',
      pairs: new Map([
        [pairKey('north', 'heat'), { units: 'degC', hindcast, observed: null }],
        [pairKey('south', 'heat'), { failure: problem.diagnostic }],
      ]),
    },
    problems: [problem],
  };
  const start = () => JSON.parse(JSON.stringify(toWireStart(outcome)));

  it('accepts what toWireStart wrote, after JSON, and fromWireStart gives the same lead values back', () => {
    const checked = checkWireStart(start());
    expect(checked.ok).toBe(true);
    if (!checked.ok) return;
    expect(fromWireStart(checked.value)).toEqual(outcome);
  });

  const damaged: [string, (w: ReturnType<typeof start>) => void, RegExp][] = [
    [
      'lead values cut short',
      (w) => (w.reduction.pairs[0][1].hindcast.values = w.reduction.pairs[0][1].hindcast.values.slice(0, 12)),
      /\/reduction\/pairs\/0\/1\/hindcast\/values does not hold 4 values/,
    ],
    [
      'beyond-table flags of another count',
      (w) => (w.reduction.pairs[0][1].hindcast.beyondTable = 'AAE='),
      /\/hindcast\/beyondTable does not hold 4 flags/,
    ],
    [
      'a failure that is not a diagnostic',
      (w) => (w.reduction.pairs[1][1].failure = { code: 'nonsense' }),
      /\/reduction\/pairs\/1\/1\/failure is not a diagnostic/,
    ],
    ['a pair without its key', (w) => w.reduction.pairs[0].shift(), /\/reduction\/pairs\/0 must NOT have fewer than 2 items/],
    ['a key that is no region|indicator pair', (w) => (w.reduction.pairs[0][0] = 'north'), /\/reduction\/pairs\/0\/0 must match pattern/],
    [
      'a lead of an unknown tier',
      (w) => (w.reduction.pairs[0][1].hindcast.leads[0].tier = 'decades'),
      /\/reduction\/pairs\/0\/1\/hindcast\/leads\/0\/tier must be equal to one of the allowed values/,
    ],
  ];
  for (const [what, damage, why] of damaged) {
    it(`refuses an answer with ${what}, saying where`, () => {
      const w = start();
      damage(w);
      const checked = checkWireStart(w);
      expect(checked.ok).toBe(false);
      if (!checked.ok) expect(checked.why).toMatch(why);
    });
  }
});
