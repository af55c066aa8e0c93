/**
 * Region weights are computed once per (grid, region set) and reused across runs: two separate processes, the
 * second reads the cache file the first wrote (shown by editing the file in between); another grid is another file.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '../..');
const DISTRICTS = join(ROOT, 'config/veloria-districts.geojson');
const run = (cacheDir: string, step: number) =>
  JSON.parse(
    execFileSync(
      process.execPath,
      [join(ROOT, 'bin/run-ts.mjs'), join(import.meta.dirname, 'weights-child.ts'), cacheDir, DISTRICTS, String(step)],
      { cwd: ROOT },
    ).toString(),
  ) as Record<string, number[]>;

describe('region weights cache (calibration.cache-dir/weights, keyed by sha256 of grid and region set)', () => {
  it("a second run reuses the first run's file; a different grid gets its own file", () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-weights-'));
    const first = run(dir, 1);
    const files = readdirSync(join(dir, 'weights'));
    expect(files).toHaveLength(1);
    expect(files[0]).toMatch(/^[0-9a-f]{64}\.json$/);
    const path = join(dir, 'weights', files[0]);
    const doc = JSON.parse(readFileSync(path, 'utf8')) as { regions: Record<string, { w: number[] }> };
    expect(doc.regions['OC-02'].w).toEqual(first['OC-02']);
    doc.regions['OC-02'].w = doc.regions['OC-02'].w.map(() => 42);
    writeFileSync(path, JSON.stringify(doc));
    expect(run(dir, 1)['OC-02'].every((w) => w === 42)).toBe(true);
    run(dir, 0.5);
    expect(readdirSync(join(dir, 'weights'))).toHaveLength(2);
  });

  it('a damaged cache file is computed again and rewritten', () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-weights-'));
    const first = run(dir, 1);
    const [file] = readdirSync(join(dir, 'weights'));
    writeFileSync(join(dir, 'weights', file), '{"format": 1, "regi');
    expect(run(dir, 1)).toEqual(first);
    expect(() => JSON.parse(readFileSync(join(dir, 'weights', file), 'utf8'))).not.toThrow();
  });
  it('a cache file of another shape (valid JSON: a weight as text, an index outside the grid, lengths that differ) is never used: computed again and rewritten', () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-weights-'));
    const first = run(dir, 1);
    const [file] = readdirSync(join(dir, 'weights'));
    const path = join(dir, 'weights', file);
    const good = readFileSync(path, 'utf8');
    const damages: ((c: { lat: unknown[]; lon: unknown[]; w: unknown[] }) => void)[] = [
      (c) => (c.w[0] = String(c.w[0])),
      (c) => (c.lat[0] = 100_000),
      (c) => c.lon.pop(),
    ];
    for (const damage of damages) {
      const doc = JSON.parse(good) as { regions: Record<string, { lat: unknown[]; lon: unknown[]; w: unknown[] }> };
      damage(doc.regions['OC-02']);
      writeFileSync(path, JSON.stringify(doc));
      expect(run(dir, 1)).toEqual(first);
      expect(JSON.parse(readFileSync(path, 'utf8'))).toEqual(JSON.parse(good));
    }
  });
});
