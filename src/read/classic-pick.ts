/**
 * Decoding only chosen elements of a hyperslab from the bytes read (big-endian, NetCDF Classic Format
 * Specification): positions are sorted once, then each block of consecutive hyperslab values takes the positions
 * that fall inside it.
 */
import type { StorageType } from './dataset.ts';

type Getter = (view: DataView, byteOffset: number) => number;

const GETTERS: Readonly<Record<StorageType, Getter>> = {
  byte: (v, o) => v.getInt8(o),
  ubyte: (v, o) => v.getUint8(o),
  char: (v, o) => v.getUint8(o),
  short: (v, o) => v.getInt16(o),
  ushort: (v, o) => v.getUint16(o),
  int: (v, o) => v.getInt32(o),
  uint: (v, o) => v.getUint32(o),
  int64: (v, o) => Number(v.getBigInt64(o)),
  uint64: (v, o) => Number(v.getBigUint64(o)),
  float: (v, o) => v.getFloat32(o),
  double: (v, o) => v.getFloat64(o),
};

/** Indices that sort `positions` ascending: position and index packed into one exact float64, sorted natively. */
function argsort(positions: Int32Array): Int32Array {
  const n = positions.length;
  const scale = 2 ** Math.ceil(Math.log2(n + 1));
  const keys = new Float64Array(n);
  for (let i = 0; i < n; i++) keys[i] = positions[i] * scale + i; // < 2^31 · 2^21, exact in a float64
  keys.sort();
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[i] = keys[i] % scale;
  return order;
}

export class PositionPicker {
  /** Indices into `positions`, ordered by position; null when `positions` is already ascending (the usual case). */
  private readonly order: Int32Array | null;
  private next = 0;
  private readonly get: Getter;
  /** float32, by far the most common stored type, decoded without the getter indirection. */
  private readonly float: boolean;

  constructor(
    private readonly positions: Int32Array,
    type: StorageType,
    private readonly elementBytes: number,
  ) {
    let ascending = true;
    for (let i = 1; i < positions.length && ascending; i++) ascending = positions[i] >= positions[i - 1];
    this.order = ascending ? null : argsort(positions);
    this.get = GETTERS[type];
    this.float = type === 'float';
  }

  /** Decodes the positions in [firstValue, firstValue + values) from `buf` (block starting at `byteOffset`) into `out`. */
  take(buf: Buffer, byteOffset: number, firstValue: number, values: number, out: Float64Array): void {
    const end = firstValue + values;
    const view = new DataView(buf.buffer, buf.byteOffset + byteOffset, values * this.elementBytes);
    const { order, positions, elementBytes } = this;
    let next = this.next;
    while (next < positions.length) {
      const k = order ? order[next] : next;
      const p = positions[k];
      if (p >= end) break;
      if (p >= firstValue) out[k] = this.float ? view.getFloat32((p - firstValue) * 4) : this.get(view, (p - firstValue) * elementBytes);
      next++;
    }
    this.next = next;
  }
}
