/**
 * sha256 of input files, streamed (never a whole file in memory), remembered per (path, size, mtime) in
 * `<cacheDir>/file-sha256.json` so that the 20 hindcast files of a source are hashed once per version, not on
 * every run. A file whose size or modification time changed is hashed again. Within one process a file is hashed
 * once however many memos ask (configurations issued together).
 */
import { createHash } from 'node:crypto';
import { createReadStream, statSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { writeFileAtomic } from './write-atomic.ts';
import { join } from 'node:path';
import { ForelightError } from './errors.ts';
import { jsonShape, parseShaped } from './json-shape.ts';

/** The one error for a file that cannot be read to checksum it. */
function unreadable(path: string, err: unknown): ForelightError {
  const why = err instanceof Error ? err.message : String(err);
  return new ForelightError(
    'calibrate',
    'checksum-read',
    `cannot read ${path} to checksum it: ${why}`,
    'check the hindcast/observation path in the YAML',
    {
      cause: err,
    },
  );
}

/** sha256 (hex) of one file's contents. */
export async function sha256File(path: string): Promise<string> {
  const h = createHash('sha256');
  try {
    for await (const chunk of createReadStream(path)) h.update(chunk as Buffer);
  } catch (err) {
    throw unreadable(path, err);
  }
  return h.digest('hex');
}

export interface ChecksumMemo {
  /** sha256 of a file, from the memo when its size and modification time are unchanged. */
  sha256(path: string): Promise<string>;
  /** Writes the memo back (atomically); a no-op when nothing new was hashed. */
  save(): Promise<void>;
}

const isMemo = jsonShape<Record<string, string>>({ type: 'object', additionalProperties: { type: 'string', pattern: '^[0-9a-f]{64}$' } });

/**
 * Hashes done or under way in this process, by path, size and modification time: configurations run together (each
 * with its own memo file) hash a shared file once.
 */
const inProcess = new Map<string, Promise<string>>();

export async function openChecksumMemo(cacheDir: string | null): Promise<ChecksumMemo> {
  const file = cacheDir ? join(cacheDir, 'file-sha256.json') : null;
  let known: Record<string, string> = {};
  if (file) {
    try {
      const read = parseShaped(await readFile(file, 'utf8'), isMemo);
      known = read.ok ? read.value : {}; // damaged: every file is hashed again
    } catch {
      known = {}; // absent or unreadable: every file is hashed again
    }
  }
  let dirty = false;
  return {
    async sha256(path) {
      let key: string;
      try {
        const s = statSync(path);
        key = `${path}|${s.size}|${s.mtimeMs}`;
      } catch (err) {
        throw unreadable(path, err);
      }
      const hit = known[key];
      if (hit) return hit;
      let hashing = inProcess.get(key);
      if (!hashing) {
        inProcess.set(key, (hashing = sha256File(path)));
        hashing.catch(() => inProcess.delete(key));
      }
      const sum = await hashing;
      known[key] = sum;
      dirty = true;
      return sum;
    },
    async save() {
      if (!file || !dirty) return;
      writeFileAtomic(file, JSON.stringify(known), 'calibrate');
      dirty = false;
    },
  };
}
