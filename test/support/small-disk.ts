/**
 * Real file-system faults for tests: a tiny tmpfs (a full disk gives ENOSPC) or a read-only tmpfs (EROFS), mounted
 * with mount(8) in a fresh temporary folder. Mounting needs root (CI runs the suite as root); `mountFaults()` says
 * whether it works here, so the tests that need it are skipped with that reason instead of passing vacuously.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface Mounted {
  readonly dir: string;
  /** Remount read-only (files stay readable; every write fails with EROFS). */
  readOnly(): void;
  unmount(): void;
}

export function mountTmpfs(sizeKb: number): Mounted {
  const dir = mkdtempSync(join(tmpdir(), 'forelight-disk-'));
  execFileSync('mount', ['-t', 'tmpfs', '-o', `size=${sizeKb}k,mode=0755`, 'tmpfs', dir]);
  return {
    dir,
    readOnly: () => execFileSync('mount', ['-o', 'remount,ro', dir]),
    unmount: () => {
      execFileSync('umount', ['-l', dir]);
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** True when this process may mount a tmpfs (a probe mount is made and removed). */
export function mountFaults(): boolean {
  try {
    mountTmpfs(64).unmount();
    return true;
  } catch {
    return false;
  }
}

/** Fills a mounted tmpfs until the next write fails with ENOSPC. */
export function fill(dir: string): void {
  try {
    execFileSync('dd', ['if=/dev/zero', `of=${join(dir, 'filler')}`, 'bs=4k'], { stdio: 'ignore' });
  } catch {
    // dd stops with "No space left on device": the disk is full
  }
}
