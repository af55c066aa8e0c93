/**
 * Decoding of the netCDF classic family's stored values: every type is big-endian on disk (Unidata, "NetCDF
 * Classic Format Specification", `values`), read here into Float64Array.
 */
import type { StorageType } from './dataset.ts';

/** Bytes per stored value of each storage type (the format specification's type sizes). */
export const STORAGE_BYTES: Readonly<Record<StorageType, number>> = {
  byte: 1,
  char: 1,
  short: 2,
  int: 4,
  float: 4,
  double: 8,
  ubyte: 1,
  ushort: 2,
  uint: 4,
  int64: 8,
  uint64: 8,
};

type SwapView = { swap: (b: Buffer) => Buffer; view: (ab: ArrayBufferLike, at: number, n: number) => ArrayLike<number> };
const BYTES = (b: Buffer): Buffer => b;
/** Types decoded by a native byte swap plus a typed-array view (fast path for aligned blocks). */
const FAST: Partial<Record<StorageType, SwapView>> = {
  byte: { swap: BYTES, view: (ab, at, n) => new Int8Array(ab, at, n) },
  ubyte: { swap: BYTES, view: (ab, at, n) => new Uint8Array(ab, at, n) },
  char: { swap: BYTES, view: (ab, at, n) => new Uint8Array(ab, at, n) },
  short: { swap: (b) => b.swap16(), view: (ab, at, n) => new Int16Array(ab, at, n) },
  ushort: { swap: (b) => b.swap16(), view: (ab, at, n) => new Uint16Array(ab, at, n) },
  int: { swap: (b) => b.swap32(), view: (ab, at, n) => new Int32Array(ab, at, n) },
  uint: { swap: (b) => b.swap32(), view: (ab, at, n) => new Uint32Array(ab, at, n) },
  float: { swap: (b) => b.swap32(), view: (ab, at, n) => new Float32Array(ab, at, n) },
  double: { swap: (b) => b.swap64(), view: (ab, at, n) => new Float64Array(ab, at, n) },
};

/**
 * Decodes `n` big-endian values of `type` from `buf` at `byteOffset` into `out` from `outOffset`.
 * Aligned blocks are byte-swapped IN PLACE in `buf` (a scratch buffer) and copied through a typed view.
 */
export function decodeBigEndian(type: StorageType, buf: Buffer, byteOffset: number, n: number, out: Float64Array, outOffset: number): void {
  const size = STORAGE_BYTES[type];
  const at = buf.byteOffset + byteOffset;
  const fast = FAST[type];
  if (fast && at % size === 0) {
    fast.swap(buf.subarray(byteOffset, byteOffset + n * size));
    out.set(fast.view(buf.buffer, at, n), outOffset);
    return;
  }
  const view = new DataView(buf.buffer, at, n * size);
  switch (type) {
    case 'byte':
      for (let i = 0; i < n; i++) out[outOffset + i] = view.getInt8(i);
      break;
    case 'char':
    case 'ubyte':
      for (let i = 0; i < n; i++) out[outOffset + i] = view.getUint8(i);
      break;
    case 'short':
      for (let i = 0; i < n; i++) out[outOffset + i] = view.getInt16(i * 2);
      break;
    case 'ushort':
      for (let i = 0; i < n; i++) out[outOffset + i] = view.getUint16(i * 2);
      break;
    case 'int':
      for (let i = 0; i < n; i++) out[outOffset + i] = view.getInt32(i * 4);
      break;
    case 'uint':
      for (let i = 0; i < n; i++) out[outOffset + i] = view.getUint32(i * 4);
      break;
    case 'float':
      for (let i = 0; i < n; i++) out[outOffset + i] = view.getFloat32(i * 4);
      break;
    case 'double':
      for (let i = 0; i < n; i++) out[outOffset + i] = view.getFloat64(i * 8);
      break;
    case 'int64':
      for (let i = 0; i < n; i++) out[outOffset + i] = Number(view.getBigInt64(i * 8));
      break;
    case 'uint64':
      for (let i = 0; i < n; i++) out[outOffset + i] = Number(view.getBigUint64(i * 8));
      break;
  }
}
