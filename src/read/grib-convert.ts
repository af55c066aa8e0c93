/**
 * GRIB (editions 1 and 2) through ecCodes, ECMWF's reference GRIB library (Debian `libeccodes-tools`): a GRIB file
 * is converted ONCE into NetCDF in a cache keyed by its sha256, then read like any NetCDF file.
 *
 * 1. `grib_copy in 'dir/m[perturbationNumber].grib'` splits the messages per ensemble member (perturbationNumber,
 *    GRIB2 product definition template 4.1/4.11, WMO Manual on Codes, FM 92; a file without it gives one part),
 *    ordered by start and step (`-B`): grib_to_netcdf lays its step axis in the order the steps first appear, so a
 *    file whose first parameter lacks step 0 (mx2t6 before tp, as ECMWF ensemble files hold them) would get
 *    steps 6, 12, …, 0.
 * 2. `grib_to_netcdf -T -D NC_FLOAT` writes each part as NetCDF: `-T` keeps the forecast reference time out of the
 *    time axis (times are `<unit> since <reference>`), `NC_FLOAT` keeps the values unpacked (the default NC_SHORT
 *    packing would lose precision). Variable names are ecCodes' `cfVarName` (2t → t2m, tp, mx2t24 …).
 * The parts are published by renaming a finished temporary folder, so a crash never leaves half a conversion.
 */
import { execFile } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, renameSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { promisify } from 'node:util';
import { errnoCode, errorMessage, InputError, stderrOf } from '../core/errors.ts';
import { sha256File } from '../core/file-checksums.ts';
import type { Dataset, VariableInfo } from './dataset.ts';

const run = promisify(execFile);

/** File names read as GRIB (also any file starting with the bytes "GRIB"). */
export const GRIB_EXTENSIONS = ['.grib2', '.grb2', '.grib', '.grb'];

export function looksLikeGrib(path: string, head: Buffer): boolean {
  return GRIB_EXTENSIONS.some((e) => path.toLowerCase().endsWith(e)) || head.toString('latin1', 0, 4) === 'GRIB';
}

/** grib_to_netcdf's dimension names → the ecCodes keys that select their messages. */
const SELECTION_KEYS: Readonly<Record<string, string>> = { date: 'dataDate', time: 'dataTime', level: 'level', step: 'step' };

/**
 * How to keep one value of an extra dimension of a converted GRIB file: NCO and CDO commands do not apply to the
 * GRIB file the user holds, ecCodes' grib_copy does (`-w key=value` keeps the matching messages).
 */
export function gribSelectionHint(path: string, dimension: string): string {
  const key = SELECTION_KEYS[dimension] ?? dimension;
  return `keep one ${dimension} with ecCodes: grib_ls -p ${key} ${path} lists them, grib_copy -w ${key}=<one of them> ${path} out.grib2 keeps its messages`;
}

/**
 * Bumped whenever the conversion itself changes (e.g. message ordering), so a conversion made by an older
 * Forelight is never reused: the cache folder name is `<CONVERSION_VERSION>-<sha256 of the GRIB file>`.
 */
const CONVERSION_VERSION = 'v2';

/** Where converted files live: `FORELIGHT_GRIB_CACHE`, else `<system temp>/forelight-grib-cache`. */
export function gribCacheDir(): string {
  return process.env.FORELIGHT_GRIB_CACHE || join(tmpdir(), 'forelight-grib-cache');
}

async function eccodes(tool: string, args: string[], file: string): Promise<void> {
  try {
    await run(tool, args, { maxBuffer: 16 * 1024 * 1024 });
  } catch (err) {
    if (errnoCode(err) === 'ENOENT') {
      throw new InputError(
        'eccodes-missing',
        file,
        `is GRIB, and reading GRIB needs ecCodes' ${tool}, which is not installed`,
        'install the Debian package libeccodes-tools (apt-get install libeccodes-tools)',
        { cause: err },
      );
    }
    const said =
      stderrOf(err)
        .split('\n')
        .map((l) => l.trim())
        .find((l) => /error/i.test(l)) ?? errorMessage(err).split('\n')[0];
    throw new InputError(
      'grib-unreadable',
      file,
      `ecCodes ${tool} could not convert the GRIB file (${said})`,
      'check that the download is complete (grib_ls lists every message) or ask the provider for the file again',
      { cause: err },
    );
  }
}

const memberOrder = (name: string): number => {
  const n = Number(/^m(.*)\.nc$/.exec(name)?.[1]);
  return Number.isFinite(n) ? n : -1;
};

/**
 * The NetCDF parts of a GRIB file, one per ensemble member in perturbationNumber order, converted on first use.
 * @throws InputError `eccodes-missing` (names the Debian package) or `grib-unreadable`.
 */
export async function gribAsNetcdf(path: string): Promise<string[]> {
  const root = gribCacheDir();
  const dir = join(root, `${CONVERSION_VERSION}-${await sha256File(path)}`);
  const list = () =>
    readdirSync(dir)
      .filter((n) => n.endsWith('.nc'))
      .sort((a, b) => memberOrder(a) - memberOrder(b))
      .map((n) => join(dir, n));
  if (existsSync(dir)) return list();
  mkdirSync(root, { recursive: true });
  const work = `${dir}.tmp-${process.pid}`;
  rmSync(work, { recursive: true, force: true });
  mkdirSync(work);
  try {
    const order = 'dataDate:i asc,dataTime:i asc,endStep:i asc';
    await eccodes('grib_copy', ['-B', order, path, join(work, 'm[perturbationNumber].grib')], path);
    for (const part of readdirSync(work).filter((n) => n.endsWith('.grib'))) {
      const nc = join(work, basename(part, '.grib').replace('not_found', '0') + '.nc');
      await eccodes('grib_to_netcdf', ['-T', '-D', 'NC_FLOAT', '-o', nc, join(work, part)], path);
      rmSync(join(work, part));
    }
    renameSync(work, dir);
  } catch (err) {
    rmSync(work, { recursive: true, force: true });
    if (existsSync(dir)) return list(); // another process finished the same conversion first
    throw err;
  }
  return list();
}

/**
 * With `grib_to_netcdf -T` and a single start, the time axis reads `<unit> since <reference>`: this adds that
 * reference as a scalar `forecast_reference_time` (CF 1.11 §4.4.1 / Appendix A standard name), so that a file
 * whose first step is not 0 (e.g. 24-h maxima from step 24) still states its start.
 */
export function withGribReference(ds: Dataset): Dataset {
  const starts = ds.variable('date');
  if (starts && starts.dimensions[0] === 'date' && starts.attributes.long_name === 'Base_date') return withStartsDimension(ds, starts);
  const time = ds.variables.find((v) => v.dimensions.length === 1 && / since /i.test(String(v.attributes.units ?? '')));
  if (!time || ds.variable('forecast_reference_time') || ds.variables.some((v) => v.name === 'time' && v !== time)) return ds;
  const reference: VariableInfo = {
    name: 'forecast_reference_time',
    dimensions: [],
    shape: [],
    type: 'double',
    attributes: { standard_name: 'forecast_reference_time', units: String(time.attributes.units) },
  };
  return {
    ...ds,
    variables: [...ds.variables, reference],
    variable: (name) => (name === reference.name ? reference : ds.variable(name)),
    readRaw: (name, start, count) => (name === reference.name ? Promise.resolve(new Float64Array(1)) : ds.readRaw(name, start, count)),
    close: () => ds.close(),
  };
}

/**
 * A GRIB file of several start dates (a hindcast of all years, as seasonal archives deliver it): grib_to_netcdf -T
 * writes the starts as `date(date)` ("Base_date") beside a `step` lead in hours. Shown with standard_name
 * forecast_reference_time (CF 1.11 §4.4), so it is read as a file of several starts (src/read/DECISIONS.md §4b).
 */
function withStartsDimension(ds: Dataset, starts: VariableInfo): Dataset {
  const reference: VariableInfo = { ...starts, attributes: { ...starts.attributes, standard_name: 'forecast_reference_time' } };
  return {
    ...ds,
    variables: ds.variables.map((v) => (v === starts ? reference : v)),
    variable: (name) => (name === starts.name ? reference : ds.variable(name)),
    readRaw: (name, start, count) => ds.readRaw(name, start, count),
    close: () => ds.close(),
  };
}
