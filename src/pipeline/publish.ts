/**
 * Files a run publishes besides e-mail: CAP XML and run.json per run, and the static archive site, rebuilt from
 * every issued run's archive entry (each kept as `<archive>/<runId>/entry.json`).
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { ForelightError, errorMessage } from '../core/errors.ts';
import { jsonShape, parseShaped } from '../core/json-shape.ts';
import { writeFileAtomic } from '../core/write-atomic.ts';
import { join } from 'node:path';
import type { Config } from '../config/types.ts';
import type { ArchiveEntry } from '../render/archive.ts';
import { MAPS_FOLDER, writeArchive } from '../render/archive.ts';
import { toToken } from '../render/safe-text.ts';

const ENTRY_FILE = 'entry.json';

const TEXT = { type: 'string' };
const FILES = (fields: readonly string[]) => ({
  type: 'array',
  items: { type: 'object', required: fields, properties: Object.fromEntries(fields.map((f) => [f, TEXT])) },
});
/** The fields the archive site reads; optional ones are absent in entries of older versions. */
const isEntry = jsonShape<ArchiveEntry>({
  type: 'object',
  required: ['runId', 'issuedAt', 'issuedDay', 'locale', 'title', 'regions', 'bodyHtml', 'charts', 'capAlerts', 'json'],
  properties: {
    runId: TEXT,
    issuedAt: TEXT,
    issuedDay: TEXT,
    locale: TEXT,
    title: TEXT,
    bodyHtml: TEXT,
    json: TEXT,
    regions: {
      type: 'array',
      items: {
        type: 'object',
        required: ['id', 'name', 'stageId', 'rank', 'label', 'glyph', 'colour', 'ink'],
        properties: {
          id: TEXT,
          name: TEXT,
          stageId: TEXT,
          rank: { type: 'integer', minimum: -1 },
          label: TEXT,
          glyph: TEXT,
          colour: TEXT,
          ink: TEXT,
          hazard: TEXT,
          dates: TEXT,
        },
      },
    },
    charts: FILES(['filename', 'svg']),
    capAlerts: FILES(['filename', 'xml']),
    pdfs: FILES(['filename', 'team', 'base64']),
    ladder: FILES(['glyph', 'label']),
  },
});

/** Every archive entry kept under the archive folder, oldest first. */
export function readArchiveEntries(dir: string): ArchiveEntry[] {
  if (!existsSync(dir)) return [];
  const entries: ArchiveEntry[] = [];
  for (const name of readdirSync(dir)) {
    const file = join(dir, name, ENTRY_FILE);
    if (!existsSync(file)) continue;
    let read: ReturnType<typeof isEntry>;
    try {
      read = parseShaped(readFileSync(file, 'utf8'), isEntry);
    } catch (err) {
      read = { ok: false, why: errorMessage(err) };
    }
    if (!read.ok)
      throw new ForelightError(
        'render',
        'archive-entry',
        `archive entry ${file} is unreadable (${read.why})`,
        'restore it from a backup or delete its folder; the archive site is rebuilt from the other entries',
      );
    entries.push(read.value);
  }
  return entries.sort((a, b) => a.issuedAt.localeCompare(b.issuedAt));
}

/** The region maps in the archive's `maps/` folder (pipeline/region-maps.ts), by source. */
function regionMapsIn(dir: string): { source: string; file: string }[] {
  const maps = join(dir, MAPS_FOLDER);
  if (!existsSync(maps)) return [];
  return readdirSync(maps)
    .filter((f) => f.endsWith('.svg'))
    .sort()
    .map((f) => ({ source: f.slice(0, -4), file: `${MAPS_FOLDER}/${f}` }));
}

/** Keeps this run's entry and rewrites the whole archive site; returns the index path. */
export function publishArchive(config: Pick<Config, 'delivery' | 'templates'>, entry: ArchiveEntry): string {
  const dir = config.delivery.archive;
  const token = toToken(entry.runId);
  if (token === '')
    throw new ForelightError(
      'render',
      'archive-entry',
      `run id '${entry.runId}' gives no archive folder name`,
      'this is a bug in Forelight: run ids are <date>-<number>',
    );
  const runDir = join(dir, token);
  writeFileAtomic(join(runDir, ENTRY_FILE), JSON.stringify(entry), 'render');
  writeArchive(dir, readArchiveEntries(dir), { templates: config.templates, maps: regionMapsIn(dir) });
  return join(dir, 'index.html');
}
