/**
 * Writing a file so that a reader (or a run after a crash) never sees half of it: the content goes to a temporary
 * name in the same folder, which is then renamed over the target (rename is atomic within one file system, POSIX).
 * A failed write removes its temporary file and throws one line naming the path, the cause and the fix; temporary
 * files left by a process killed mid-write are swept at the next start (`sweepStaleTemps`).
 */
import { existsSync, mkdirSync, readdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { ForelightError, type Stage, errnoCode } from './errors.ts';
import { isProcessAlive } from './process-alive.ts';

const TEMP_MARK = '.tmp-';

/** What to do about a failed write, by errno (POSIX errno names, as Node reports them). */
export function fixFor(code: string | undefined, dir: string): string {
  switch (code) {
    case 'ENOSPC':
    case 'EDQUOT':
      return `the disk holding ${dir} is full: free space there (or point the config at a folder on another disk) and run again`;
    case 'EROFS':
      return `${dir} is on a read-only file system: remount it read-write or point the config at a writable folder`;
    case 'EACCES':
    case 'EPERM':
      return `Forelight may not write in ${dir}: give its user write permission there or point the config at a writable folder`;
    case 'ENOENT':
      return `${dir} does not exist: create it or fix the path in the config`;
    case 'ENOTDIR':
      return `part of the path ${dir} is a file, not a folder: fix the path in the config`;
    default:
      return `check that ${dir} exists, is writable and has free space`;
  }
}

/** One-line error for a failed write of `path` (the errno code is kept as the error's `code` suffix). */
export function writeFault(stage: Stage, path: string, err: unknown, what = 'file'): ForelightError {
  const code = errnoCode(err);
  const reason = code ?? (err instanceof Error ? err.message : String(err));
  return new ForelightError(stage, 'write-failed', `cannot write ${what} (${reason})`, fixFor(code, dirname(path)), {
    cause: err,
    place: { file: path },
  });
}

/**
 * `mkdir -p` that reports the real cause: Node's recursive mkdirSync says ENOENT where the file system said
 * EROFS or EACCES, so each missing folder is created on its own.
 */
export function makeFolder(dir: string): void {
  if (existsSync(dir)) return;
  const parent = dirname(dir);
  if (parent !== dir) makeFolder(parent);
  try {
    mkdirSync(dir);
  } catch (err) {
    if (errnoCode(err) !== 'EEXIST') throw err;
  }
}

/** Writes `path` atomically, creating its folder; on failure nothing is left behind and a `writeFault` is thrown. */
export function writeFileAtomic(path: string, content: string | Uint8Array, stage: Stage = 'ledger'): void {
  const tmp = `${path}${TEMP_MARK}${process.pid}`;
  try {
    makeFolder(dirname(path));
    writeFileSync(tmp, content);
    renameSync(tmp, path);
  } catch (err) {
    rmSync(tmp, { force: true });
    throw err instanceof ForelightError ? err : writeFault(stage, path, err);
  }
}

/**
 * Removes `<name>.tmp-<pid>` files in `dir` (and, with `recursive`, below it) whose writing process is gone;
 * returns the paths removed. A folder that does not exist or cannot be read is skipped.
 */
export function sweepStaleTemps(dir: string, recursive = false): string[] {
  let names: string[];
  try {
    names = readdirSync(dir, { recursive, encoding: 'utf8' });
  } catch {
    return [];
  }
  const removed: string[] = [];
  for (const name of names) {
    const at = name.lastIndexOf(TEMP_MARK);
    if (at < 0) continue;
    const pid = Number(name.slice(at + TEMP_MARK.length));
    // A live writer (this process included) is still writing it.
    if (!Number.isInteger(pid) || pid === process.pid || isProcessAlive(pid)) continue;
    const path = join(dir, name);
    try {
      rmSync(path, { force: true });
      removed.push(path);
    } catch {
      // left for the next sweep
    }
  }
  return removed;
}
