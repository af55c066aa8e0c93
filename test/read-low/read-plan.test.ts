/**
 * Read planning: byte offsets follow the classic layout (Unidata, "NetCDF Classic Format Specification":
 * non-record variables are contiguous C-order arrays; record variables interleave, one slab per record).
 */
import { describe, expect, it } from 'vitest';
import { planReads } from '../../src/read/classic-hyperslab.ts';

describe('planReads', () => {
  it('reads a 10×10 box of a 1000×1000 float grid as one span of 10 blocks', () => {
    const plan = planReads(1000, [4000, 4], 4, [1000, 1000], [500, 200], [10, 10]);
    expect(plan.spans).toEqual([
      {
        offset: 1000 + 500 * 4000 + 200 * 4,
        bytes: 9 * 4000 + 40,
        blockOffsets: [0, 4000, 8000, 12000, 16000, 20000, 24000, 28000, 32000, 36000],
      },
    ]);
    expect(plan.blockValues).toBe(10);
  });

  it('merges whole rows into one contiguous block', () => {
    const plan = planReads(0, [48, 24, 4], 4, [3, 2, 6], [1, 0, 0], [2, 2, 6]);
    expect(plan).toEqual({ blockValues: 24, totalValues: 24, spans: [{ offset: 48, bytes: 96, blockOffsets: [0] }] });
  });

  it('reads one record slab per record for an interleaved record variable', () => {
    // record size 100 bytes; variable (time, 5) of shorts starting at byte 300.
    const plan = planReads(300, [100, 2], 2, [4, 5], [1, 0], [3, 5]);
    expect(plan.blockValues).toBe(5);
    expect(plan.spans).toEqual([{ offset: 400, bytes: 210, blockOffsets: [0, 100, 200] }]);
  });

  it('splits far-apart blocks (a point series through 1 GiB steps) into separate reads', () => {
    const step = 2 ** 30;
    const plan = planReads(2 ** 32, [step, 4], 4, [6, step / 4], [0, 7], [3, 1]);
    expect(plan.spans.map((s) => s.offset)).toEqual([2 ** 32 + 28, 2 ** 32 + step + 28, 2 ** 32 + 2 * step + 28]);
    expect(plan.spans.every((s) => s.bytes === 4)).toBe(true);
  });

  it('plans a scalar and an empty box', () => {
    expect(planReads(64, [], 8, [], [], [])).toEqual({
      blockValues: 1,
      totalValues: 1,
      spans: [{ offset: 64, bytes: 8, blockOffsets: [0] }],
    });
    expect(planReads(64, [4], 4, [3], [1], [0]).spans).toEqual([]);
  });
});
