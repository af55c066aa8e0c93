/**
 * Atomic writes under real disk faults (a full tmpfs → ENOSPC, a read-only tmpfs → EROFS; errno names as in
 * POSIX.1-2017 <errno.h>): one line naming the path and the fix, no temporary file left behind, and temporary
 * files of dead writers swept at the next start.
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { sweepStaleTemps, writeFileAtomic } from '../../src/core/write-atomic.ts';
import { fill, mountFaults, mountTmpfs, type Mounted } from '../support/small-disk.ts';

const canMount = mountFaults();
const mounts: Mounted[] = [];
afterEach(() => {
  for (const m of mounts.splice(0)) m.unmount();
});

describe.skipIf(!canMount)('writeFileAtomic on a faulty disk (needs root to mount tmpfs)', () => {
  it('full disk: ENOSPC named with the path and the fix; the 0-byte temporary file is removed; the old file is intact', () => {
    const disk = mountTmpfs(64);
    mounts.push(disk);
    const target = join(disk.dir, 'status.json');
    writeFileAtomic(target, 'old');
    fill(disk.dir);
    expect(() => writeFileAtomic(target, 'x'.repeat(200_000))).toThrow(
      new RegExp(`^${target}: cannot write file \\(ENOSPC\\) — the disk holding ${disk.dir} is full: free space there`),
    );
    expect(readdirSync(disk.dir).filter((f) => f.includes('.tmp-'))).toEqual([]);
    expect(readFileSync(target, 'utf8')).toBe('old');
  });

  it('read-only file system: EROFS named with the path and what to do', () => {
    const disk = mountTmpfs(64);
    mounts.push(disk);
    disk.readOnly();
    expect(() => writeFileAtomic(join(disk.dir, 'a', 'entry.json'), '{}', 'render')).toThrow(
      /\(EROFS\) — .* is on a read-only file system: remount it read-write or point the config at a writable folder/,
    );
  });
});

describe('sweepStaleTemps', () => {
  it('removes temporary files of processes that are gone, keeps those of live ones and every other file', () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-sweep-'));
    const deadPid = 2 ** 22 + 12345; // above Linux's pid_max limit (2^22): never a live process
    writeFileSync(join(dir, `status.json.tmp-${deadPid}`), '');
    writeFileSync(join(dir, `status.json.tmp-${process.pid}`), '');
    writeFileSync(join(dir, 'status.json'), '{}');
    expect(sweepStaleTemps(dir)).toEqual([join(dir, `status.json.tmp-${deadPid}`)]);
    expect(readdirSync(dir).sort()).toEqual(['status.json', `status.json.tmp-${process.pid}`]);
    expect(sweepStaleTemps(join(dir, 'missing'))).toEqual([]);
    expect(existsSync(join(dir, 'status.json'))).toBe(true);
  });
});
