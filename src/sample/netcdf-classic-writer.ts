/**
 * A small streaming writer for the NetCDF classic formats (CDF-1 "classic", CDF-2 "64-bit offset", CDF-5
 * "64-bit data"), following Unidata, "The NetCDF Classic Format Specification" (netCDF-C documentation,
 * file_format_specifications). The header is computed and written first, with every variable's `begin`
 * offset; values are then written by slabs at their computed positions, so a multi-GB file never sits in
 * memory. Record (unlimited-dimension) variables need their record count declared up front.
 */
import { open, type FileHandle } from 'node:fs/promises';
import {
  HeaderBuilder,
  NC_DIMENSION,
  NC_VARIABLE,
  TYPE_CODE,
  TYPE_SIZE,
  VERSION,
  encodeValues,
  padTo4,
  writeAttributes,
  type NcFileSpec,
  type NcVariableSpec,
} from './netcdf-classic-header.ts';

export type { NcAttribute, NcDimensionSpec, NcFileSpec, NcFormat, NcType, NcVariableSpec } from './netcdf-classic-header.ts';

interface VariableLayout {
  readonly spec: NcVariableSpec;
  readonly isRecord: boolean;
  /** Elements in one record (record variable) or in the whole variable (fixed). */
  readonly elementsPerRecord: number;
  readonly totalElements: number;
  readonly vsize: number;
  begin: number;
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
    if (spec.dimensions.filter((d) => d.unlimited).length > 1)
      throw new RangeError(`${path}: more than one unlimited dimension; the classic format allows one`);
    const numrecs = recordDim?.size ?? 0;
    const layouts: VariableLayout[] = spec.variables.map((v) => {
      const ds = v.dimensions.map((name) => {
        const d = dims.get(name);
        if (!d) throw new RangeError(`${path}: variable ${v.name} uses undeclared dimension ${name}; declare it in dimensions`);
        return d;
      });
      if (ds.slice(1).some((d) => d.unlimited))
        throw new RangeError(`${path}: variable ${v.name} has the unlimited dimension not first; move it first`);
      const isRecord = ds.length > 0 && ds[0].unlimited === true;
      const elementsPerRecord = ds.slice(isRecord ? 1 : 0).reduce((p, d) => p * d.size, 1);
      const bytes = elementsPerRecord * TYPE_SIZE[v.type];
      return {
        spec: v,
        isRecord,
        elementsPerRecord,
        totalElements: elementsPerRecord * (isRecord ? numrecs : 1),
        vsize: padTo4(bytes),
        begin: 0,
      };
    });
    const recordVars = layouts.filter((l) => l.isRecord);
    // Spec: with exactly one record variable, records are not padded.
    const recordSize =
      recordVars.length === 1
        ? recordVars[0].elementsPerRecord * TYPE_SIZE[recordVars[0].spec.type]
        : recordVars.reduce((s, l) => s + l.vsize, 0);
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
