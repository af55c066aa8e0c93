/**
 * Header parser for the netCDF classic family: CDF-1 (classic), CDF-2 (64-bit offset) and CDF-5
 * (64-bit data), after Unidata, "NetCDF Classic Format Specification" (the BNF grammar of
 * `header = magic numrecs dim_list gatt_list var_list`). Works on a byte prefix of the file and asks
 * for a longer prefix (HeaderNeedsMoreBytes) when the header runs past it.
 */
import type { AttributeValue, DimensionInfo, StorageType } from './dataset.ts';

export type ClassicVersion = 1 | 2 | 5;

export interface ClassicVariable {
  readonly name: string;
  readonly dimensions: readonly string[];
  readonly shape: readonly number[];
  readonly type: StorageType;
  readonly attributes: Readonly<Record<string, AttributeValue>>;
  readonly isRecord: boolean;
  /** Byte offset of the variable's first value (of its first record for record variables). */
  readonly begin: number;
  /** Bytes of one value. */
  readonly elementBytes: number;
  /** Unpadded bytes of the whole variable (non-record) or of one record (record variable). */
  readonly dataBytes: number;
}

export interface ClassicHeader {
  readonly version: ClassicVersion;
  /** Number of records, or -1 when the header says STREAMING (count from the file size). */
  readonly numRecords: number;
  readonly dimensions: readonly DimensionInfo[];
  readonly attributes: Readonly<Record<string, AttributeValue>>;
  readonly variables: readonly ClassicVariable[];
  /** Bytes between the starts of two consecutive records. */
  readonly recordBytes: number;
}

/** Thrown when the header continues past the bytes given; the caller retries with more. */
export class HeaderNeedsMoreBytes extends Error {}

const NC_DIMENSION = 0x0a;
const NC_VARIABLE = 0x0b;
const NC_ATTRIBUTE = 0x0c;
const STREAMING = 0xffffffff;

const TYPES: Record<number, { type: StorageType; bytes: number }> = {
  1: { type: 'byte', bytes: 1 },
  2: { type: 'char', bytes: 1 },
  3: { type: 'short', bytes: 2 },
  4: { type: 'int', bytes: 4 },
  5: { type: 'float', bytes: 4 },
  6: { type: 'double', bytes: 8 },
  7: { type: 'ubyte', bytes: 1 },
  8: { type: 'ushort', bytes: 2 },
  9: { type: 'uint', bytes: 4 },
  10: { type: 'int64', bytes: 8 },
  11: { type: 'uint64', bytes: 8 },
};

/** Bytes per stored value of each storage type. */
export const STORAGE_BYTES: Readonly<Record<StorageType, number>> = Object.fromEntries(
  Object.values(TYPES).map((t) => [t.type, t.bytes]),
) as Record<StorageType, number>;

class Cursor {
  pos = 4;
  constructor(
    readonly bytes: Buffer,
    readonly version: ClassicVersion,
  ) {}

  need(n: number): void {
    if (this.pos + n > this.bytes.length) throw new HeaderNeedsMoreBytes(`header needs byte ${this.pos + n}`);
  }
  u32(): number {
    this.need(4);
    const v = this.bytes.readUInt32BE(this.pos);
    this.pos += 4;
    return v;
  }
  u64(): number {
    this.need(8);
    const v = Number(this.bytes.readBigUInt64BE(this.pos));
    this.pos += 8;
    return v;
  }
  /** NON_NEG: 4 bytes in CDF-1/2, 8 bytes in CDF-5. */
  count(): number {
    return this.version === 5 ? this.u64() : this.u32();
  }
  /** OFFSET: 4 bytes in CDF-1, 8 bytes in CDF-2 and CDF-5. */
  offset(): number {
    return this.version === 1 ? this.u32() : this.u64();
  }
  padded(n: number): Buffer {
    const padded = Math.ceil(n / 4) * 4;
    this.need(padded);
    const out = this.bytes.subarray(this.pos, this.pos + n);
    this.pos += padded;
    return out;
  }
  name(): string {
    return this.padded(this.count()).toString('utf8').normalize('NFC');
  }
}

function readAttributes(c: Cursor): Record<string, AttributeValue> {
  const tag = c.u32();
  const n = c.count();
  if (tag === 0 && n === 0) return {};
  if (tag !== NC_ATTRIBUTE) throw new Error(`expected attribute list tag at byte ${c.pos - 8}`);
  const out: Record<string, AttributeValue> = {};
  for (let i = 0; i < n; i++) {
    const name = c.name();
    const code = c.u32();
    const t = TYPES[code];
    if (!t) throw new Error(`unknown attribute type ${code} for attribute '${name}'`);
    const nelems = c.count();
    const raw = c.padded(nelems * t.bytes);
    if (t.type === 'char') {
      out[name] = raw.toString('utf8').replace(/\0+$/, '');
    } else {
      const values = new Float64Array(nelems);
      decodeBigEndian(t.type, raw, 0, nelems, values, 0);
      out[name] = nelems === 1 ? values[0] : Array.from(values);
    }
  }
  return out;
}

/** Parses a classic-family header from `bytes` (a prefix of the file starting at byte 0). */
export function parseClassicHeader(bytes: Buffer): ClassicHeader {
  const version = bytes[3] as ClassicVersion; // 1, 2 or 5: open-dataset.ts sends only files with these magic bytes here
  const c = new Cursor(bytes, version);
  const numRecordsRaw = c.count();
  const numRecords = numRecordsRaw === STREAMING && version !== 5 ? -1 : numRecordsRaw;

  const dimTag = c.u32();
  const dimCount = c.count();
  if (!(dimTag === 0 && dimCount === 0) && dimTag !== NC_DIMENSION) throw new Error('expected dimension list tag at byte 4');
  const dims: { name: string; size: number; unlimited: boolean }[] = [];
  for (let i = 0; i < (dimTag === 0 ? 0 : dimCount); i++) {
    const name = c.name();
    const size = c.count();
    dims.push({ name, size, unlimited: size === 0 });
  }
  const attributes = readAttributes(c);

  const varTag = c.u32();
  const varCount = c.count();
  if (!(varTag === 0 && varCount === 0) && varTag !== NC_VARIABLE) throw new Error('expected variable list tag');
  const parsed: { name: string; dimIds: number[]; attributes: Record<string, AttributeValue>; code: number; begin: number }[] = [];
  for (let i = 0; i < (varTag === 0 ? 0 : varCount); i++) {
    const name = c.name();
    const rank = c.count();
    const dimIds: number[] = [];
    for (let d = 0; d < rank; d++) dimIds.push(c.count());
    const varAttributes = readAttributes(c);
    const code = c.u32();
    c.count(); // vsize: recomputed below, since it saturates at 2^32-1 for large variables
    const begin = c.offset();
    parsed.push({ name, dimIds, attributes: varAttributes, code, begin });
  }

  const variables: ClassicVariable[] = parsed.map((p) => {
    const t = TYPES[p.code];
    if (!t) throw new Error(`unknown type ${p.code} of variable '${p.name}'`);
    const vdims = p.dimIds.map((id) => {
      const d = dims[id];
      if (!d) throw new Error(`variable '${p.name}' names dimension id ${id}, which does not exist`);
      return d;
    });
    const isRecord = vdims.length > 0 && vdims[0].unlimited;
    let dataBytes = t.bytes;
    for (let d = isRecord ? 1 : 0; d < vdims.length; d++) dataBytes *= vdims[d].size;
    return {
      name: p.name,
      dimensions: vdims.map((d) => d.name),
      shape: vdims.map((d) => d.size),
      type: t.type,
      attributes: p.attributes,
      isRecord,
      begin: p.begin,
      elementBytes: t.bytes,
      dataBytes,
    };
  });

  const recordVars = variables.filter((v) => v.isRecord);
  // Spec: each record variable's slab is padded to 4 bytes, except when it is the only record variable.
  const recordBytes =
    recordVars.length === 1 ? recordVars[0].dataBytes : recordVars.reduce((sum, v) => sum + Math.ceil(v.dataBytes / 4) * 4, 0);
  return { version, numRecords, dimensions: dims, attributes, variables, recordBytes };
}

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
