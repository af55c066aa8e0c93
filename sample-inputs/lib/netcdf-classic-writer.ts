/**
 * A small streaming writer for the NetCDF classic formats (CDF-1 "classic", CDF-2 "64-bit offset", CDF-5
 * "64-bit data"), following Unidata, "The NetCDF Classic Format Specification" (netCDF-C documentation,
 * file_format_specifications). The header is computed and written first, with every variable's `begin`
 * offset; values are then written by slabs at their computed positions, so a multi-GB file never sits in
 * memory. Record (unlimited-dimension) variables need their record count declared up front.
 */
import { open, type FileHandle } from 'node:fs/promises';

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

const TYPE_CODE: Record<NcType, number> = { byte: 1, char: 2, short: 3, int: 4, float: 5, double: 6 };
const TYPE_SIZE: Record<NcType, number> = { byte: 1, char: 1, short: 2, int: 4, float: 4, double: 8 };
const VERSION: Record<NcFormat, number> = { classic: 1, '64bit-offset': 2, cdf5: 5 };
const NC_DIMENSION = 0x0a;
const NC_VARIABLE = 0x0b;
const NC_ATTRIBUTE = 0x0c;

interface VariableLayout {
  readonly spec: NcVariableSpec;
  readonly isRecord: boolean;
  /** Elements in one record (record variable) or in the whole variable (fixed). */
  readonly elementsPerRecord: number;
  readonly totalElements: number;
  readonly vsize: number;
  begin: number;
}

const padTo4 = (n: number): number => Math.ceil(n / 4) * 4;

/** Appends big-endian header fields; CDF-5 widens counts and lengths to 64 bits. */
class HeaderBuilder {
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

function writeAttributes(h: HeaderBuilder, attrs: Readonly<Record<string, NcAttribute>> | undefined): void {
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

/** A NetCDF classic-format file being written. Create with `createNetcdfClassic`. */
export class NetcdfClassicWriter {
  private constructor(
    readonly path: string,
    private readonly handle: FileHandle,
    private readonly layouts: ReadonlyMap<string, VariableLayout>,
    private readonly recordSize: number,
    readonly totalBytes: number,
  ) {}

  /** Computes the layout, writes the header and sizes the file. */
  static async create(path: string, spec: NcFileSpec): Promise<NetcdfClassicWriter> {
    const version = VERSION[spec.format];
    const dims = new Map(spec.dimensions.map((d, i) => [d.name, { ...d, id: i }]));
    const recordDim = spec.dimensions.find((d) => d.unlimited);
    if (spec.dimensions.filter((d) => d.unlimited).length > 1) throw new RangeError(`${path}: more than one unlimited dimension; the classic format allows one`);
    const numrecs = recordDim?.size ?? 0;
    const layouts: VariableLayout[] = spec.variables.map((v) => {
      const ds = v.dimensions.map((name) => {
        const d = dims.get(name);
        if (!d) throw new RangeError(`${path}: variable ${v.name} uses undeclared dimension ${name}; declare it in dimensions`);
        return d;
      });
      if (ds.slice(1).some((d) => d.unlimited)) throw new RangeError(`${path}: variable ${v.name} has the unlimited dimension not first; move it first`);
      const isRecord = ds.length > 0 && ds[0].unlimited === true;
      const elementsPerRecord = ds.slice(isRecord ? 1 : 0).reduce((p, d) => p * d.size, 1);
      const bytes = elementsPerRecord * TYPE_SIZE[v.type];
      return { spec: v, isRecord, elementsPerRecord, totalElements: elementsPerRecord * (isRecord ? numrecs : 1), vsize: padTo4(bytes), begin: 0 };
    });
    const recordVars = layouts.filter((l) => l.isRecord);
    // Spec: with exactly one record variable, records are not padded.
    const recordSize = recordVars.length === 1 ? recordVars[0].elementsPerRecord * TYPE_SIZE[recordVars[0].spec.type] : recordVars.reduce((s, l) => s + l.vsize, 0);
    const buildHeader = (): Buffer => {
      const h = new HeaderBuilder(version);
      h.raw(Buffer.from([0x43, 0x44, 0x46, version]));
      h.count(numrecs);
      if (spec.dimensions.length === 0) h.absent();
      else {
        h.int32(NC_DIMENSION);
        h.count(spec.dimensions.length);
        for (const d of spec.dimensions) {
          h.name(d.name);
          h.count(d.unlimited ? 0 : d.size);
        }
      }
      writeAttributes(h, spec.attributes);
      if (layouts.length === 0) h.absent();
      else {
        h.int32(NC_VARIABLE);
        h.count(layouts.length);
        for (const l of layouts) {
          h.name(l.spec.name);
          h.count(l.spec.dimensions.length);
          for (const name of l.spec.dimensions) h.count(dims.get(name)!.id);
          writeAttributes(h, l.spec.attributes);
          h.int32(TYPE_CODE[l.spec.type]);
          // vsize does not fit 32 bits for a > 4 GiB variable: the spec says write 2^32 - 1.
          h.count(version !== 5 && l.vsize > 0xffffffff ? 0xffffffff : l.vsize);
          h.offset(l.begin);
        }
      }
      return h.toBuffer();
    };
    // Offsets do not change the header length, so size the header once, then assign begins.
    let cursor = buildHeader().length;
    for (const l of layouts.filter((x) => !x.isRecord)) {
      l.begin = cursor;
      cursor += l.vsize;
    }
    const recordStart = cursor;
    for (const l of recordVars) {
      l.begin = cursor;
      cursor += l.vsize;
    }
    const totalBytes = recordStart + recordSize * numrecs;
    const lastBegin = Math.max(0, ...layouts.map((l) => l.begin));
    if (version === 1 && lastBegin > 0x7fffffff) throw new RangeError(`${path}: offsets exceed 2 GiB; use format 64bit-offset or cdf5`);
    const handle = await open(path, 'w');
    await handle.write(buildHeader(), 0, undefined, 0);
    await handle.truncate(totalBytes);
    return new NetcdfClassicWriter(path, handle, new Map(layouts.map((l) => [l.spec.name, l])), recordSize, totalBytes);
  }

  /**
   * Writes `values` (stored type units, i.e. already packed) at flat C-order element index `first` of
   * variable `name`. Record variables are split across records transparently.
   */
  async write(name: string, first: number, values: ArrayLike<number>): Promise<void> {
    const l = this.layouts.get(name);
    if (!l) throw new RangeError(`${this.path}: no variable ${name} in the file spec`);
    if (first < 0 || first + values.length > l.totalElements) {
      throw new RangeError(`${this.path}: write of ${values.length} values at ${first} overruns ${name} (${l.totalElements} elements)`);
    }
    const size = TYPE_SIZE[l.spec.type];
    const bytes = encodeValues(l.spec.type, values);
    if (!l.isRecord) {
      await this.writeAll(bytes, l.begin + first * size);
      return;
    }
    let done = 0;
    while (done < values.length) {
      const index = first + done;
      const rec = Math.floor(index / l.elementsPerRecord);
      const within = index - rec * l.elementsPerRecord;
      const n = Math.min(values.length - done, l.elementsPerRecord - within);
      await this.writeAll(bytes.subarray(done * size, (done + n) * size), l.begin + rec * this.recordSize + within * size);
      done += n;
    }
  }

  private async writeAll(bytes: Buffer, position: number): Promise<void> {
    let off = 0;
    while (off < bytes.length) {
      const { bytesWritten } = await this.handle.write(bytes, off, bytes.length - off, position + off);
      off += bytesWritten;
    }
  }

  async close(): Promise<void> {
    await this.handle.close();
  }
}

/** Opens `path` for writing with the layout of `spec` (see `NetcdfClassicWriter`). */
export function createNetcdfClassic(path: string, spec: NcFileSpec): Promise<NetcdfClassicWriter> {
  return NetcdfClassicWriter.create(path, spec);
}
