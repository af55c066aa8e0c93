/**
 * Files a run publishes besides e-mail: CAP XML and run.json per run, and the static archive site, rebuilt from
 * every issued run's archive entry (each kept as `<archive>/<runId>/entry.json`).
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { ForelightError } from '../core/errors.ts';
import { writeFileAtomic } from '../core/write-atomic.ts';
import { join } from 'node:path';
import type { Config } from '../config/types.ts';
import type { ArchiveEntry } from '../render/archive.ts';
import { writeArchive } from '../render/archive.ts';
import { toToken } from '../render/safe-text.ts';

const ENTRY_FILE = 'entry.json';

/** Every archive entry kept under the archive folder, oldest first. */
export function readArchiveEntries(dir: string): ArchiveEntry[] {
  if (!existsSync(dir)) return [];
  const entries: ArchiveEntry[] = [];
  for (const name of readdirSync(dir)) {
    const file = join(dir, name, ENTRY_FILE);
    if (!existsSync(file)) continue;
    try {
      entries.push(JSON.parse(readFileSync(file, 'utf8')) as ArchiveEntry);
    } catch (err) {
      throw new ForelightError('render', 'archive-entry', `archive entry ${file} is unreadable (${(err as Error).message})`, 'restore it from a backup or delete its folder; the archive site is rebuilt from the other entries', { cause: err });
    }
  }
  return entries.sort((a, b) => a.issuedAt.localeCompare(b.issuedAt));
}

/** Keeps this run's entry and rewrites the whole archive site; returns the index path. */
export function publishArchive(config: Config, entry: ArchiveEntry): string {
  const dir = config.delivery.archive;
  const runDir = join(dir, toToken(entry.runId));
  writeFileAtomic(join(runDir, ENTRY_FILE), JSON.stringify(entry), 'render');
  writeArchive(dir, readArchiveEntries(dir), { templates: config.templates });
  return join(dir, 'index.html');
}
