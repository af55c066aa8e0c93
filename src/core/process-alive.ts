import { errnoCode } from './errors.ts';

/** Whether a process id is alive on this host (signal 0 probes without signalling). */
export function isProcessAlive(pid: number): boolean {
  if (!Number.isInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    // EPERM: the process exists but belongs to another user.
    return errnoCode(err) === 'EPERM';
  }
}
