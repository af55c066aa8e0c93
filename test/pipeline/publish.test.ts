/** The archive folder's per-run entries: read back oldest first; a damaged entry is named with what to do. */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ForelightError } from '../../src/core/errors.ts';
import { readArchiveEntries } from '../../src/pipeline/publish.ts';

const dir = mkdtempSync(join(tmpdir(), 'forelight-archive-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('readArchiveEntries', () => {
  it('returns the entries oldest first, skips folders without one, and names a damaged entry', () => {
    for (const [run, issuedAt] of [
      ['2026-11-26-2', '2026-11-26T07:30:00Z'],
      ['2026-11-23-1', '2026-11-23T07:30:00Z'],
    ]) {
      mkdirSync(join(dir, run));
      const entry = {
        runId: run,
        issuedAt,
        issuedDay: issuedAt.slice(0, 10),
        locale: 'en',
        title: `Bulletin ${run}`,
        regions: [],
        bodyHtml: '<p>x</p>',
        charts: [],
        capAlerts: [],
        json: '{}',
      };
      writeFileSync(join(dir, run, 'entry.json'), JSON.stringify(entry));
    }
    mkdirSync(join(dir, 'assets'));
    expect(readArchiveEntries(dir).map((e) => e.runId)).toEqual(['2026-11-23-1', '2026-11-26-2']);
    mkdirSync(join(dir, '2026-11-30-3'));
    writeFileSync(join(dir, '2026-11-30-3', 'entry.json'), '{"runId": "2026-11-30-3", "issu');
    expect(() => readArchiveEntries(dir)).toThrow(ForelightError);
    expect(() => readArchiveEntries(dir)).toThrow(
      new RegExp(
        `^archive entry ${join(dir, '2026-11-30-3', 'entry.json')} is unreadable \\(.+\\) — restore it from a backup or delete its folder`,
      ),
    );
    // Valid JSON without the fields the site needs is named too (ajv, JSON Schema 2020-12), not trusted by a cast.
    writeFileSync(join(dir, '2026-11-30-3', 'entry.json'), JSON.stringify({ runId: '2026-11-30-3', issuedAt: '2026-11-30T07:30:00Z' }));
    expect(() => readArchiveEntries(dir)).toThrow(
      new RegExp(`^archive entry ${join(dir, '2026-11-30-3', 'entry.json')} is unreadable \\(/ must have required property 'issuedDay'\\)`),
    );
  });
});
