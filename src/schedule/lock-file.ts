/**
 * One Forelight run at a time: a lock file created atomically (`wx`) holding pid, host and start time.
 * A lock is stale when its process is dead (same host) or it is older than `maxAgeSeconds` (any host, e.g. a
 * shared folder); a stale lock is moved aside under a unique name and re-checked before it is removed, so two
 * processes breaking the same stale lock cannot both win.
 */
import { jsonShape, parseShaped } from '../core/json-shape.ts';
import { openSync, readFileSync, renameSync, rmSync, writeSync, closeSync } from 'node:fs';
import { hostname } from 'node:os';
import { ForelightError, errnoCode, errorMessage } from '../core/errors.ts';
import { isProcessAlive } from '../core/process-alive.ts';

export interface LockInfo {
  readonly pid: number;
  readonly host: string;
  readonly startedAt: string;
}

const isLockInfo = jsonShape<LockInfo>({
  type: 'object',
  required: ['pid', 'host', 'startedAt'],
  properties: { pid: { type: 'integer' }, host: { type: 'string' }, startedAt: { type: 'string' } },
});

export interface HeldLock {
  readonly path: string;
  readonly info: LockInfo;
  /** Remove the lock if it is still ours. */
  release(): void;
}

export type LockResult =
  { readonly acquired: true; readonly lock: HeldLock } | { readonly acquired: false; readonly holder: LockInfo | null };

function readLock(path: string): { text: string; info: LockInfo | null } | null {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (err) {
    if (errnoCode(err) === 'ENOENT') return null;
    throw err;
  }
  const info = parseShaped(text, isLockInfo);
  return { text, info: info.ok ? info.value : null };
}

export function isLockStale(info: LockInfo | null, maxAgeSeconds: number, now: Date): boolean {
  if (!info) return true; // unreadable or half-written by a crashed process
  const ageSeconds = (now.getTime() - Date.parse(info.startedAt)) / 1000;
  if (!(ageSeconds <= maxAgeSeconds)) return true;
  return info.host === hostname() && !isProcessAlive(info.pid);
}

export function acquireLock(path: string, options: { maxAgeSeconds: number; now?: () => Date }): LockResult {
  const now = options.now ?? (() => new Date());
  for (let attempt = 0; attempt < 3; attempt++) {
    const info: LockInfo = { pid: process.pid, host: hostname(), startedAt: now().toISOString() };
    try {
      const fd = openSync(path, 'wx', 0o644);
      try {
        writeSync(fd, JSON.stringify(info) + '\n');
      } finally {
        closeSync(fd);
      }
      const text = JSON.stringify(info) + '\n';
      return {
        acquired: true,
        lock: {
          path,
          info,
          release: () => {
            if (readLock(path)?.text === text) rmSync(path, { force: true });
          },
        },
      };
    } catch (err) {
      if (errnoCode(err) !== 'EEXIST') {
        throw new ForelightError(
          'schedule',
          'lock-create',
          `cannot create lock file ${path}: ${errorMessage(err)}`,
          'check that its folder exists and is writable',
          { cause: err },
        );
      }
    }
    const current = readLock(path);
    if (current === null) continue; // released meanwhile
    if (!isLockStale(current.info, options.maxAgeSeconds, now())) return { acquired: false, holder: current.info };
    const aside = `${path}.stale-${process.pid}-${attempt}`;
    try {
      renameSync(path, aside);
    } catch {
      continue; // someone else moved it first
    }
    if (readLock(aside)?.text !== current.text) {
      renameSync(aside, path); // we moved a fresh lock taken meanwhile: put it back
      return { acquired: false, holder: readLock(path)?.info ?? null };
    }
    rmSync(aside, { force: true });
  }
  return { acquired: false, holder: readLock(path)?.info ?? null };
}
