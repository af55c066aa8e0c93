/**
 * Commands printed in fixes (ogr2ogr, gdalwarp) so that they run as pasted into a POSIX shell from any directory:
 * full paths, each one shell word (single-quoted when it holds anything but plain path characters).
 */
import { basename, dirname, extname, join } from 'node:path';

export function shellWord(path: string): string {
  return /^[\w./+:@%=-]+$/.test(path) ? path : `'${path.replaceAll("'", `'\\''`)}'`;
}

/** `<dir of file>/<stem>-wgs84<ext>`: where a reprojected copy of `file` is written, beside the original. */
export function wgs84Copy(file: string, ext = extname(file)): string {
  return join(dirname(file), `${basename(file, extname(file))}-wgs84${ext}`);
}
