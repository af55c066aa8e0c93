/**
 * Dataset over a NetCDF-4 (HDF5) file through h5wasm. h5wasm's Node build uses Emscripten NODERAWFS,
 * so HDF5 reads the host file directly by offset (no copy of the file into memory); each readRaw
 * decompresses only the chunks that intersect the requested hyperslab. NetCDF-4 dimensions are the
 * HDF5 dimension scales attached to each variable (`hdf5-metadata.ts`, netCDF-C's mapping).
 */
import { createRequire } from 'node:module';
import { resolve } from 'node:path';
import type { Dataset as H5Dataset, File as H5File } from 'h5wasm/node';
import { InputError } from '../core/errors.ts';
import { variableNotFound, type AttributeValue, type Dataset, type DimensionInfo, type VariableInfo } from './dataset.ts';
import { validateSelection } from './classic-hyperslab.ts';
import { checkHdf5Filters } from './hdf5-filters.ts';
import { netcdfMetadata, type Hdf5Variable } from './hdf5-metadata.ts';
import { checkIdentity, fileIdentity, readSlab } from './hdf5-slab.mjs';
import { packageExportPath } from './hdf5-package.ts';
import { type Hdf5SlicePool, SliceError, sharedSlicePool } from './hdf5-slice-pool.ts';

type H5wasm = (typeof import('h5wasm/node'))['default'];
let ready: Promise<H5wasm> | undefined;

/**
 * Loads h5wasm on first use (classic-only runs do not pay for its WebAssembly) and switches on its
 * throwing error handler, so a failed read throws instead of returning garbage. It is loaded with
 * require() (Node >= 20.19 loads ES modules synchronously that way), which bypasses tsx's loader hooks:
 * through them its 4 MB JavaScript took ~630 MB RSS and 3-8 s; this way ~0.2 s and ~30 MB (measured).
 */
function loadH5wasm(): Promise<H5wasm> {
  ready ??= (async () => {
    const mod = createRequire(import.meta.url)(packageExportPath('h5wasm', './node')) as typeof import('h5wasm/node');
    const module = await mod.default.ready;
    module.activate_throwing_error_handler();
    return mod.default;
  })();
  return ready;
}

function oneLine(err: unknown): string {
  const text = err instanceof Error ? err.message : String(err);
  return text
    .split('\n')
    .map((l) => l.trim())
    .filter(Boolean)
    .slice(0, 4)
    .join(' | ')
    .slice(0, 400);
}

class Hdf5Dataset implements Dataset {
  readonly format = 'netcdf4' as const;
  private readonly byName: Map<string, Hdf5Variable>;
  private readonly filtersChecked = new Set<string>();

  constructor(
    readonly path: string,
    private readonly file: H5File,
    readonly dimensions: readonly DimensionInfo[],
    readonly attributes: Readonly<Record<string, AttributeValue>>,
    readonly variables: readonly Hdf5Variable[],
    private readonly pool: Hdf5SlicePool | null,
    /** hdf5-slab.mjs `fileIdentity` at open: pool workers open the file themselves and check it is the same. */
    private readonly identity: string,
  ) {
    this.byName = new Map(variables.map((v) => [v.name, v]));
  }

  variable(name: string): VariableInfo | undefined {
    return this.byName.get(name);
  }

  /** Reads in flight that extract-reduce.ts may keep: enough to keep every pool worker busy. */
  get readAhead(): number {
    return this.pool ? this.pool.size * 2 : 1;
  }

  readRaw(name: string, start: readonly number[], count: readonly number[]): Promise<Float64Array> {
    return this.read(name, start, count);
  }

  readRawAt(name: string, start: readonly number[], count: readonly number[], positions: Int32Array): Promise<Float64Array> {
    return this.read(name, start, count, positions);
  }

  /** Checks the selection and the variable's filters here, then decompresses on a pool worker (or in this thread). */
  private async read(name: string, start: readonly number[], count: readonly number[], positions?: Int32Array): Promise<Float64Array> {
    const v = this.byName.get(name);
    if (!v) throw variableNotFound(this.path, name, this.variables);
    const total = validateSelection(this.path, v, start, count);
    if (!v.numeric)
      throw new InputError('input-type', this.path, `variable '${name}' is not numeric`, 'choose a numeric variable in the source config');
    if (!this.filtersChecked.has(name)) {
      checkHdf5Filters(this.path, name, (this.file.get(name) as H5Dataset).filters);
      this.filtersChecked.add(name);
    }
    if (total === 0) return new Float64Array(0);
    const scalar = v.shape.length === 0;
    const [from, size] = scalar ? [[], []] : [start, count];
    try {
      if (this.pool)
        return await this.pool.read({ path: resolve(this.path), identity: this.identity, name, start: from, count: size, positions });
      checkIdentity(this.path, this.identity);
      return readSlab(this.file, name, from, size, positions);
    } catch (err) {
      throw this.readError(name, err);
    }
  }

  /** The InputError for a failed read: what went wrong, in this file and variable, and what to do. */
  private readError(name: string, err: unknown): InputError {
    // hdf5-slab.mjs (plain JavaScript, shared with the read workers) throws Errors with a `kind` field.
    const kind = err instanceof SliceError ? err.kind : (err as { kind?: string } | null)?.kind;
    const text = oneLine(err);
    switch (kind) {
      case 'not-numeric':
        return new InputError('input-type', this.path, text, 'choose a numeric variable in the source config', { cause: err });
      case 'changed':
        return new InputError(
          'input-changed',
          this.path,
          `${text} (variable '${name}')`,
          'run again once the download has finished; deliver files by writing to a temporary name and renaming',
          { cause: err },
        );
      case 'worker':
        return new InputError(
          'read-worker',
          this.path,
          `reading variable '${name}' failed: ${text}`,
          'run again; if it repeats, set FORELIGHT_READ_THREADS=0 to read in the main thread and report the file',
          { cause: err },
        );
      default:
        return new InputError(
          'input-hdf5',
          this.path,
          `HDF5 could not read variable '${name}' (${text})`,
          'check the file with `ncdump -h -s`; re-create it with `nccopy -d1` if a filter is missing',
          { cause: err },
        );
    }
  }

  async close(): Promise<void> {
    this.file.close();
    this.pool?.forget(resolve(this.path));
  }
}

/**
 * End-of-file address from the superblock (HDF Group, "HDF5 File Format Specification" v3, §II.A:
 * versions 0/1 hold it after base and free-space addresses, versions 2/3 after base and extension
 * addresses), or undefined when the prefix is too short or the version unknown.
 */
export function hdf5EndOfFile(prefix: Buffer): number | undefined {
  const version = prefix[8];
  const offsetBytes = prefix[version <= 1 ? 13 : 9];
  if (offsetBytes !== 8 && offsetBytes !== 4) return undefined;
  const fieldsStart = version === 0 ? 24 : version === 1 ? 28 : version <= 3 ? 12 : -1;
  const at = fieldsStart + 2 * offsetBytes;
  if (fieldsStart < 0 || at + offsetBytes > prefix.length) return undefined;
  const read = (pos: number): number => (offsetBytes === 8 ? Number(prefix.readBigUInt64LE(pos)) : prefix.readUInt32LE(pos));
  return read(fieldsStart) + read(at);
}

/** Opens a NetCDF-4/HDF5 file whose magic bytes were already checked; `prefix` is its first bytes. */
export async function openHdf5Dataset(file: string, prefix: Buffer, fileBytes: number): Promise<Dataset> {
  const expected = hdf5EndOfFile(prefix);
  if (expected !== undefined && expected > fileBytes) {
    throw new InputError('input-truncated', file, `file is truncated: expected ${expected} bytes, found ${fileBytes}`, 're-download it');
  }
  const pool = sharedSlicePool(); // a bad FORELIGHT_READ_THREADS is its own error, not this file's
  const identity = fileIdentity(resolve(file));
  const h5wasm = await loadH5wasm();
  let h5: H5File;
  try {
    h5 = new h5wasm.File(resolve(file), 'r');
  } catch (err) {
    throw new InputError(
      'input-corrupt',
      file,
      `HDF5 could not open the file (${oneLine(err)})`,
      're-download it or check it with `ncdump -h`',
      { cause: err },
    );
  }
  try {
    const { dimensions, attributes, variables } = netcdfMetadata(h5, (e): e is H5Dataset => e instanceof h5wasm.Dataset);
    return new Hdf5Dataset(file, h5, dimensions, attributes, variables, pool, identity);
  } catch (err) {
    h5.close();
    if (err instanceof InputError) throw err;
    throw new InputError(
      'input-corrupt',
      file,
      `NetCDF-4 metadata could not be read (${oneLine(err)})`,
      'check the file with `ncdump -h`',
      { cause: err },
    );
  }
}
