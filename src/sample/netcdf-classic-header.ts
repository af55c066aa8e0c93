/**
 * Header encoding of the NetCDF classic formats, per Unidata, "The NetCDF Classic Format Specification"
 * (netCDF-C documentation): big-endian fields, names and values padded to 4 bytes, NON_NEG counts as
 * 32-bit unsigned (CDF-1, CDF-2) or 64-bit (CDF-5), OFFSET as 32-bit (CDF-1) or 64-bit (CDF-2, CDF-5).
 */

export type NcFormat = 'classic' | '64bit-offset' | 'cdf5';
export type NcType = 'byte' | 'char' | 'short' | 'int' | 'float' | 'double';

/** An attribute: text, or numbers of a stated type (a bare number is a double). */
export type NcAttribute = string | number | { readonly type: Exclude<NcType, 'char'>; readonly values: readonly number[] };

export interface NcDimensionSpec {
  readonly name: string;
  readonly size: number;
  /** The record dimension: at most one, and it must be the first dimension of the variables using it. */
  readonly unlimited?: boolean;
}

export interface NcVariableSpec {
  readonly name: string;
  readonly type: Exclude<NcType, 'char'>;
  readonly dimensions: readonly string[];
  readonly attributes?: Readonly<Record<string, NcAttribute>>;
}

export interface NcFileSpec {
  readonly format: NcFormat;
  readonly dimensions: readonly NcDimensionSpec[];
  readonly attributes?: Readonly<Record<string, NcAttribute>>;
  readonly variables: readonly NcVariableSpec[];
}

export const TYPE_CODE: Record<NcType, number> = { byte: 1, char: 2, short: 3, int: 4, float: 5, double: 6 };
export const TYPE_SIZE: Record<NcType, number> = { byte: 1, char: 1, short: 2, int: 4, float: 4, double: 8 };
export const VERSION: Record<NcFormat, number> = { classic: 1, '64bit-offset': 2, cdf5: 5 };
export const NC_DIMENSION = 0x0a;
export const NC_VARIABLE = 0x0b;
const NC_ATTRIBUTE = 0x0c;

export const padTo4 = (n: number): number => Math.ceil(n / 4) * 4;

/** Appends big-endian header fields; CDF-5 widens counts and lengths to 64 bits. */
export class HeaderBuilder {
  private readonly parts: Buffer[] = [];
  constructor(private readonly version: number) {}
  get length(): number {
    return this.parts.reduce((s, b) => s + b.length, 0);
  }
  int32(v: number): void {
    const b = Buffer.alloc(4);
    b.writeInt32BE(v);
    this.parts.push(b);
  }
  int64(v: number): void {
    const b = Buffer.alloc(8);
    b.writeBigInt64BE(BigInt(v));
    this.parts.push(b);
  }
  /** NON_NEG: nelems, dimension lengths, vsize (unsigned 32 bits, or INT64 in CDF-5). */
  count(v: number): void {
    if (this.version === 5) return this.int64(v);
    const b = Buffer.alloc(4);
    b.writeUInt32BE(v);
    this.parts.push(b);
  }
  /** OFFSET: variable begin (INT32 in CDF-1, INT64 otherwise). */
  offset(v: number): void {
    if (this.version === 1) this.int32(v);
    else this.int64(v);
  }
  name(s: string): void {
    const bytes = Buffer.from(s, 'utf8');
    this.count(bytes.length);
    this.parts.push(bytes, Buffer.alloc(padTo4(bytes.length) - bytes.length));
  }
  raw(b: Buffer): void {
    this.parts.push(b, Buffer.alloc(padTo4(b.length) - b.length));
  }
  absent(): void {
    this.int32(0);
    this.count(0);
  }
  toBuffer(): Buffer {
    return Buffer.concat(this.parts);
  }
}

/** Big-endian bytes of `values` stored as `type`. */
export function encodeValues(type: NcType, values: ArrayLike<number>): Buffer {
  const n = values.length;
  const size = TYPE_SIZE[type];
  if (type === 'float' && values instanceof Float32Array) return Buffer.from(Float32Array.from(values).buffer).swap32();
  if (type === 'short' && values instanceof Int16Array) return Buffer.from(Int16Array.from(values).buffer).swap16();
  const b = Buffer.alloc(n * size);
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (type === 'byte' || type === 'char') b.writeInt8(v, i);
    else if (type === 'short') b.writeInt16BE(v, 2 * i);
    else if (type === 'int') b.writeInt32BE(v, 4 * i);
    else if (type === 'float') b.writeFloatBE(v, 4 * i);
    else b.writeDoubleBE(v, 8 * i);
  }
  return b;
}

export function writeAttributes(h: HeaderBuilder, attrs: Readonly<Record<string, NcAttribute>> | undefined): void {
  const entries = Object.entries(attrs ?? {});
  if (entries.length === 0) return h.absent();
  h.int32(NC_ATTRIBUTE);
  h.count(entries.length);
  for (const [name, value] of entries) {
    h.name(name);
    if (typeof value === 'string') {
      const bytes = Buffer.from(value, 'utf8');
      h.int32(TYPE_CODE.char);
      h.count(bytes.length);
      h.raw(bytes);
    } else {
      const { type, values } = typeof value === 'number' ? { type: 'double' as const, values: [value] } : value;
      h.int32(TYPE_CODE[type]);
      h.count(values.length);
      h.raw(encodeValues(type, values));
    }
  }
}
