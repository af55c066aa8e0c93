/**
 * Header parser for the netCDF classic family: CDF-1 (classic), CDF-2 (64-bit offset) and CDF-5
 * (64-bit data), after Unidata, "NetCDF Classic Format Specification" (the BNF grammar of
 * `header = magic numrecs dim_list gatt_list var_list`). Works on a byte prefix of the file and asks
 * for a longer prefix (HeaderNeedsMoreBytes) when the header runs past it.
 */
import type { AttributeValue, DimensionInfo, StorageType } from './dataset.ts';
import { decodeBigEndian, STORAGE_BYTES } from './classic-values.ts';

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

/** Type codes of the format specification (NC_BYTE = 1 … NC_UINT64 = 11), in code order. */
const TYPE_CODES: readonly StorageType[] = [
  'byte',
  'char',
  'short',
  'int',
  'float',
  'double',
  'ubyte',
  'ushort',
  'uint',
  'int64',
  'uint64',
];
const TYPES: Record<number, { type: StorageType; bytes: number }> = Object.fromEntries(
  TYPE_CODES.map((type, i) => [i + 1, { type, bytes: STORAGE_BYTES[type] }]),
);

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
