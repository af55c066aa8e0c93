/**
 * Writing a file so that a reader (or a run after a crash) never sees half of it: the content goes to a temporary
 * name in the same folder, which is then renamed over the target (rename is atomic within one file system, POSIX).
 */
import { renameSync, writeFileSync } from 'node:fs';

export function writeFileAtomic(path: string, content: string | Uint8Array): void {
  const tmp = `${path}.tmp-${process.pid}`;
  writeFileSync(tmp, content);
  renameSync(tmp, path);
}
