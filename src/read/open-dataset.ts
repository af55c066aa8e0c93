/**
 * Entry point of the low-level reader: sniffs the magic bytes and opens the matching implementation.
 * Magic numbers from Unidata, "NetCDF Classic Format Specification" (CDF\x01, \x02, \x05) and the HDF
 * Group, "HDF5 File Format Specification" (superblock signature \x89HDF\r\n\x1a\n at offset 0).
 */
import { open } from 'node:fs/promises';
import { InputError, errnoCode } from '../core/errors.ts';
import type { Dataset } from './dataset.ts';
import { openClassicDataset } from './classic-dataset.ts';
import { openHdf5Dataset } from './hdf5-dataset.ts';
import { gribAsNetcdf, looksLikeGrib, withGribReference } from './grib-convert.ts';
import { stackMembers } from './member-stack.ts';

const HDF5_SIGNATURE = Buffer.from([0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a]);

function describeMagic(bytes: Buffer): string {
  if (bytes.length === 0) return 'the file is empty';
  const text = [...bytes.subarray(0, 4)]
    .map((b) => (b >= 0x20 && b < 0x7f ? String.fromCharCode(b) : `\\x${b.toString(16).padStart(2, '0')}`))
    .join('');
  return `starts with "${text}"`;
}

/** What to do with a file that is neither NetCDF nor GRIB: what portals deliver instead (archives, error pages). */
function notNetcdfHint(path: string, head: Buffer): string {
  if (head.length === 0) return 'download it again (an interrupted download leaves an empty file)';
  if (head[0] === 0x1f && head[1] === 0x8b)
    return `it is gzip-compressed: decompress it first (gunzip -c ${path} > unpacked.nc) and point the source at that file`;
  if (head.toString('latin1', 0, 4) === 'PK\x03\x04')
    return `it is a zip archive (as data portals deliver several files): unpack it first (unzip ${path}) and point the source at the files inside`;
  if ([...head].every((b) => b === 0x09 || b === 0x0a || b === 0x0d || (b >= 0x20 && b < 0x7f)))
    return 'it is text (an error page or a listing?), not data: check the source path, or download the file again';
  return 'check the source path: Forelight reads NetCDF (classic, 64-bit offset, CDF-5, NetCDF-4) and GRIB files';
}

/** Opens a NetCDF file of any supported flavour (classic, 64-bit offset, CDF-5, NetCDF-4/HDF5), or GRIB through ecCodes. */
export async function openDataset(path: string): Promise<Dataset> {
  const head = await readHead(path);
  if (looksLikeGrib(path, head)) return openGrib(path);
  return openNetcdf(path);
}

async function readHead(path: string): Promise<Buffer> {
  const handle = await open(path, 'r').catch(() => null);
  if (!handle) return Buffer.alloc(0); // openNetcdf names the problem
  try {
    const head = Buffer.alloc(4);
    const { bytesRead } = await handle.read(head, 0, 4, 0);
    return head.subarray(0, bytesRead);
  } catch {
    return Buffer.alloc(0); // a folder (EISDIR) or an unreadable file: openNetcdf names the problem
  } finally {
    await handle.close();
  }
}

/** A GRIB file as the NetCDF parts ecCodes converted it to (grib-convert.ts), members stacked in order. */
async function openGrib(path: string): Promise<Dataset> {
  const parts: Dataset[] = [];
  try {
    for (const nc of await gribAsNetcdf(path)) parts.push(await openNetcdf(nc));
    if (parts.length === 0)
      throw new InputError('grib-empty', path, 'holds no GRIB message', 'check that the download is complete (grib_ls lists the messages)');
    return withGribReference(await stackMembers(path, parts));
  } catch (err) {
    for (const p of parts) await p.close().catch(() => undefined);
    throw err;
  }
}

async function openNetcdf(path: string): Promise<Dataset> {
  let handle;
  try {
    handle = await open(path, 'r');
  } catch (err) {
    throw new InputError(
      'input-missing',
      path,
      `cannot open the file (${errnoCode(err) ?? String(err)})`,
      'check the path (sources[].forecast-files in the config, or the command line) and that the download finished',
      { cause: err },
    );
  }
  let owned = false;
  try {
    const stats = await handle.stat();
    if (stats.isDirectory())
      throw new InputError(
        'input-folder',
        path,
        'is a folder, not a NetCDF file',
        'point sources[].forecast-files (or the command line) at a file; remove the folder if a download created it by mistake',
      );
    const { size } = stats;
    const magic = Buffer.alloc(64);
    const { bytesRead } = await handle.read(magic, 0, 64, 0);
    const head = magic.subarray(0, bytesRead);
    if (bytesRead >= 4 && head.toString('latin1', 0, 3) === 'CDF' && [1, 2, 5].includes(head[3])) {
      owned = true;
      return await openClassicDataset(path, handle, size);
    }
    if (bytesRead >= 8 && head.subarray(0, 8).equals(HDF5_SIGNATURE)) return await openHdf5Dataset(path, head, size);
    throw new InputError(
      'input-format',
      path,
      `not a NetCDF file (${describeMagic(head)}; expected CDF\\x01, CDF\\x02, CDF\\x05 or an HDF5 signature)`,
      notNetcdfHint(path, head),
    );
  } catch (err) {
    if (owned) await handle.close().catch(() => undefined);
    throw err;
  } finally {
    if (!owned) await handle.close();
  }
}

/**
 * The member files of one forecast (one file per member or member group, `{member}` in `forecast-files`) as one
 * dataset named after the first, members in the order given (member-stack.ts checks grids and times).
 */
export async function openMemberFiles(paths: readonly string[]): Promise<Dataset> {
  if (paths.length === 1) return openDataset(paths[0]);
  const parts: Dataset[] = [];
  try {
    for (const p of paths) parts.push(await openDataset(p));
    return await stackMembers(paths[0], parts);
  } catch (err) {
    for (const p of parts) await p.close().catch(() => undefined);
    throw err;
  }
}

/** Opens `path` (with `moreMembers`: the member files after it), runs `use` on it and closes it again, also when `use` throws. */
export async function withDataset<T>(path: string, use: (ds: Dataset) => Promise<T>, moreMembers: readonly string[] = []): Promise<T> {
  const ds = await openMemberFiles([path, ...moreMembers]);
  try {
    return await use(ds);
  } finally {
    await ds.close();
  }
}
