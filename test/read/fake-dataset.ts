/**
 * A small in-memory `Dataset` for unit tests of the high-level readers: values are stored raw (before CF
 * decoding) in C order and `readRaw` cuts the requested hyperslab, as the real readers do.
 */
import type { AttributeValue, Dataset, DimensionInfo, StorageType, VariableInfo } from '../../src/read/dataset.ts';

export interface FakeVariable {
  readonly dimensions: readonly string[];
  readonly attributes?: Record<string, AttributeValue>;
  readonly type?: StorageType;
  readonly data: ArrayLike<number>;
}

export interface FakeSpec {
  readonly path?: string;
  readonly dimensions: Record<string, number>;
  readonly attributes?: Record<string, AttributeValue>;
  readonly variables: Record<string, FakeVariable>;
}

export interface ReadLog {
  /** Each readRaw call: variable name and number of values returned. */
  readonly reads: { name: string; values: number }[];
}

/** Builds a `Dataset` from plain arrays; `reads` logs every readRaw call. */
export function makeFakeDataset(spec: FakeSpec): Dataset & ReadLog {
  const dimensions: DimensionInfo[] = Object.entries(spec.dimensions).map(([name, size]) => ({ name, size, unlimited: false }));
  const sizeOf = (d: string): number => {
    const s = spec.dimensions[d];
    if (s === undefined) throw new Error(`fake dataset: unknown dimension ${d}`);
    return s;
  };
  const variables: VariableInfo[] = Object.entries(spec.variables).map(([name, v]) => {
    const shape = v.dimensions.map(sizeOf);
    const total = shape.reduce((a, b) => a * b, 1);
    if (v.data.length !== total) throw new Error(`fake dataset: ${name} has ${v.data.length} values, shape needs ${total}`);
    return { name, dimensions: v.dimensions, shape, type: v.type ?? 'double', attributes: v.attributes ?? {} };
  });
  const ds = {
    path: spec.path ?? 'fake.nc',
    format: 'classic' as const,
    dimensions,
    attributes: spec.attributes ?? {},
    variables,
    reads: [] as { name: string; values: number }[],
    variable: (name: string) => variables.find((v) => v.name === name),
    async readRaw(name: string, start: readonly number[], count: readonly number[]): Promise<Float64Array> {
      const info = variables.find((v) => v.name === name);
      if (!info) throw new Error(`fake dataset: no variable ${name}`);
      const data = spec.variables[name].data;
      const rank = info.shape.length;
      const strides = new Array<number>(rank).fill(1);
      for (let k = rank - 2; k >= 0; k--) strides[k] = strides[k + 1] * info.shape[k + 1];
      for (let k = 0; k < rank; k++) {
        if (start[k] < 0 || count[k] < 0 || start[k] + count[k] > info.shape[k]) throw new Error(`fake dataset: ${name} slab out of range`);
      }
      const total = count.reduce((a, b) => a * b, 1);
      const out = new Float64Array(total);
      const idx = new Array<number>(rank).fill(0);
      for (let n = 0; n < total; n++) {
        let off = 0;
        for (let k = 0; k < rank; k++) off += (start[k] + idx[k]) * strides[k];
        out[n] = data[off];
        for (let k = rank - 1; k >= 0; k--) {
          if (++idx[k] < count[k]) break;
          idx[k] = 0;
        }
      }
      ds.reads.push({ name, values: total });
      return out;
    },
    async close(): Promise<void> {},
  };
  return ds;
}
