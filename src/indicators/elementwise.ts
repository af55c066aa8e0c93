/**
 * Vectorised application of scalar formulas over typed arrays, with the flag counts every indicator reports.
 * Convention shared by all formula functions: a scalar formula returns NaN for inputs outside its valid range.
 * Here a NaN result is counted as `missing` when an input was already NaN, otherwise as `outOfRange`.
 * No allocation per value; `out` may alias an input.
 */
export interface ElementwiseCounts {
  readonly outOfRange: number;
  readonly missing: number;
}

function checkLengths(out: Float64Array, ...inputs: ArrayLike<number>[]): void {
  for (const a of inputs) {
    if (a.length !== out.length) throw new RangeError(`elementwise: input length ${a.length} differs from output length ${out.length}`);
  }
}

export function mapElementwise2(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  out: Float64Array,
  f: (x: number, y: number) => number,
): ElementwiseCounts {
  checkLengths(out, a, b);
  let outOfRange = 0;
  let missing = 0;
  for (let i = 0; i < out.length; i++) {
    const x = a[i];
    const y = b[i];
    const v = f(x, y);
    out[i] = v;
    if (Number.isNaN(v)) {
      if (Number.isNaN(x) || Number.isNaN(y)) missing++;
      else outOfRange++;
    }
  }
  return { outOfRange, missing };
}

export function mapElementwise3(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  c: ArrayLike<number>,
  out: Float64Array,
  f: (x: number, y: number, z: number) => number,
): ElementwiseCounts {
  checkLengths(out, a, b, c);
  let outOfRange = 0;
  let missing = 0;
  for (let i = 0; i < out.length; i++) {
    const x = a[i];
    const y = b[i];
    const z = c[i];
    const v = f(x, y, z);
    out[i] = v;
    if (Number.isNaN(v)) {
      if (Number.isNaN(x) || Number.isNaN(y) || Number.isNaN(z)) missing++;
      else outOfRange++;
    }
  }
  return { outOfRange, missing };
}
