/** Skill cache keyed by content checksums; hashes checked against Debian coreutils `sha256sum`. */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cachedSkill, fingerprint, hashFiles, skillCacheKey } from '../../src/calibrate/skill-cache.ts';
import { fromStored, isStoredClimates, toStored, type StoredClimate } from '../../src/calibrate/stored-climate.ts';
import { jsonShape } from '../../src/core/json-shape.ts';
import { openChecksumMemo } from '../../src/core/file-checksums.ts';

const dir = mkdtempSync(join(tmpdir(), 'forelight-calib-'));
const a = join(dir, 'hc_2006.nc');
const b = join(dir, 'hc_2007.nc');
const obs = join(dir, 'obs.nc');
writeFileSync(a, Buffer.alloc(3_000_000, 7)); // several stream chunks
writeFileSync(b, 'hindcast 2007');
writeFileSync(obs, 'observations');

describe('hashFiles', () => {
  it('equals sha256 over the lines "<sha256sum of each file>\\n" (coreutils sha256sum)', async () => {
    const sums = [a, b].map((f) => execFileSync('sha256sum', [f]).toString().split(' ')[0]);
    const want = execFileSync('sha256sum', [], { input: sums.map((s) => `${s}\n`).join('') })
      .toString()
      .split(' ')[0];
    expect(await hashFiles([a, b])).toBe(want);
  });
  it('a missing file gives a one-line error naming it', async () => {
    await expect(hashFiles([join(dir, 'nope.nc')])).rejects.toThrow(/nope\.nc/);
  });
});

const anyObject = jsonShape<unknown>({ type: 'object' });
const aNumber = jsonShape<unknown>({ type: 'number' });

describe('cachedSkill', () => {
  it('computes once, then reads the cache; NaN and Infinity survive; a changed byte changes the key', async () => {
    const cacheDir = join(dir, 'cache');
    const key = await skillCacheKey({ hindcastFiles: [a, b], observationsFile: obs, configFingerprint: fingerprint({ x: 1, y: [2] }) });
    let calls = 0;
    const compute = () => {
      calls++;
      return { bs: NaN, top: Infinity, low: -Infinity, rows: [{ n: 1.5 }] };
    };
    const first = await cachedSkill(cacheDir, key, compute, anyObject);
    const second = await cachedSkill(cacheDir, key, compute, anyObject);
    expect(calls).toBe(1);
    expect(first.fromCache).toBe(false);
    expect(second.fromCache).toBe(true);
    expect(second.value).toEqual({ bs: NaN, top: Infinity, low: -Infinity, rows: [{ n: 1.5 }] });
    expect(readdirSync(cacheDir)).toEqual([`skill-${key}.json`]);
    writeFileSync(b, 'hindcast 2007!');
    const key2 = await skillCacheKey({ hindcastFiles: [a, b], observationsFile: obs, configFingerprint: fingerprint({ y: [2], x: 1 }) });
    expect(key2).not.toBe(key);
    await cachedSkill(cacheDir, key2, compute, anyObject);
    expect(calls).toBe(2);
  });
  it('config fingerprint ignores key order but not values; the observations file counts', async () => {
    expect(fingerprint({ a: 1, b: { c: 2, d: 3 } })).toBe(fingerprint({ b: { d: 3, c: 2 }, a: 1 }));
    expect(fingerprint({ a: 1 })).not.toBe(fingerprint({ a: 2 }));
    const k1 = await skillCacheKey({ hindcastFiles: [a], observationsFile: obs, configFingerprint: 'f' });
    const k2 = await skillCacheKey({ hindcastFiles: [a], observationsFile: null, configFingerprint: 'f' });
    expect(k1).not.toBe(k2);
  });
  it('a corrupt entry is recomputed and overwritten, with a note', async () => {
    const cacheDir = join(dir, 'cache2');
    await cachedSkill(cacheDir, 'k', () => 1, aNumber);
    writeFileSync(join(cacheDir, 'skill-k.json'), '{broken');
    const r = await cachedSkill(cacheDir, 'k', () => 2, aNumber);
    expect(r.value).toBe(2);
    expect(r.note).toMatch(/unreadable .* recomputed/);
    expect((await cachedSkill(cacheDir, 'k', () => 3, aNumber)).value).toBe(2);
  });
  it('an entry of another shape (valid JSON, e.g. left by an older format) is recomputed, the note names where it differs', async () => {
    const cacheDir = join(dir, 'cache3');
    const key = 'shape';
    await cachedSkill(cacheDir, key, () => [{ region: 'north' }], anyObject);
    writeFileSync(join(cacheDir, `skill-${key}.json`), JSON.stringify([{ region: 'north', indicator: 'hi', hindcast: 1 }]));
    const recomputed: StoredClimate[] = [];
    const r = await cachedSkill(cacheDir, key, () => recomputed, isStoredClimates);
    expect(r.fromCache).toBe(false);
    expect(r.value).toBe(recomputed);
    expect(r.note).toMatch(/skill-shape\.json unreadable \(\/0 must have required property 'observed'\); recomputed/);
    // A tuned trigger of the format before out-of-sample tuning (a bare number) is refused.
    const base = { region: 'north', indicator: 'hi', hindcast: null, observed: null, skill: [], problems: [] };
    writeFileSync(join(cacheDir, `skill-${key}.json`), JSON.stringify([{ ...base, tuned: { r1: 0.3 } }]));
    expect((await cachedSkill(cacheDir, key, () => [], isStoredClimates)).note).toMatch(/\/0\/tuned\/r1 must be object/);
    const trigger = {
      costLoss: 0.2,
      basis: 'observed',
      hindcastMembers: 10,
      hindcastCount: 1,
      forecastThreshold: 0.067,
      value: { value: { $num: 'NaN' }, inSampleValue: 0.3, interval: { low: { $num: 'NaN' }, high: { $num: 'NaN' } } },
    };
    const stored = [{ ...base, tuned: { r1: trigger } }];
    writeFileSync(join(cacheDir, `skill-${key}.json`), JSON.stringify(stored));
    const back = await cachedSkill(cacheDir, key, () => [], isStoredClimates);
    const decoded = { ...trigger, value: { value: NaN, inSampleValue: 0.3, interval: { low: NaN, high: NaN } } };
    expect(back).toEqual({ value: [{ ...stored[0], tuned: { r1: decoded } }], fromCache: true, note: '' });
    // A stored non-finite number other than the three JSON cannot hold (here "NaNx") is a damaged entry, never read as NaN.
    const forged = { ...trigger, value: { ...trigger.value, value: { $num: 'NaNx' } } };
    writeFileSync(join(cacheDir, `skill-${key}.json`), JSON.stringify([{ ...base, tuned: { r1: forged } }]));
    const refused = await cachedSkill(cacheDir, key, () => [], isStoredClimates);
    expect(refused.fromCache).toBe(false);
    expect(refused.note).toMatch(/\/0\/tuned\/r1\/value\/value must be number\); recomputed/);
  });
});

describe('stored lead values (base64 of little-endian doubles)', () => {
  const climate = {
    years: [2006, 2007],
    members: 1,
    leads: [{ tier: 'days' as const, index: 1, start: '2026-11-26', end: '2026-11-26' }],
    units: 'degC',
    values: new Float64Array([Number.NaN, 0.1 + 0.2]),
  };
  it("encodes as python3's base64.b64encode(struct.pack('<2d', nan, 0.1 + 0.2)) does, and decodes to the same doubles", () => {
    const py = "import base64, struct; print(base64.b64encode(struct.pack('<2d', float('nan'), 0.1 + 0.2)).decode())";
    const stored = toStored(climate);
    expect(stored?.values).toBe(execFileSync('/usr/bin/python3', ['-c', py], { encoding: 'utf8' }).trim());
    expect(Array.from(fromStored(stored)?.values ?? [])).toEqual([Number.NaN, 0.30000000000000004]);
  });
  it('an entry whose values do not hold years × members × leads doubles is refused, naming the climate', () => {
    const entry = (values: string) => [
      { region: 'north', indicator: 'hi', hindcast: { ...toStored(climate), values }, observed: null, skill: [], tuned: {}, problems: [] },
    ];
    expect(isStoredClimates(entry(toStored(climate)?.values ?? '')).ok).toBe(true);
    expect(isStoredClimates(entry('AAAAAAAA+H8=')).ok).toBe(false);
    expect(isStoredClimates(entry('AAAAAAAA+H8='))).toMatchObject({
      why: '/0/hindcast/values holds 8 bytes, expected 16 bytes (2 years × 1 members × 1 leads × 8)',
    });
    expect(isStoredClimates(entry('AAAAAAAA+H8=AAAAAAAA+H8!'))).toMatchObject({
      why: expect.stringMatching(/^\/0\/hindcast\/values is not base64/),
    });
  });
});

describe('checksum memo (file-sha256.json)', () => {
  it('remembers a checksum per path, size and mtime; a rewritten file is hashed again (sha256 as coreutils sha256sum)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-memo-'));
    const f = join(dir, 'hc.nc');
    writeFileSync(f, 'first');
    const memo = await openChecksumMemo(dir);
    const first = await memo.sha256(f);
    expect(first).toBe(execFileSync('sha256sum', [f], { encoding: 'utf8' }).split(' ')[0]);
    await memo.save();
    const again = await openChecksumMemo(dir);
    expect(await again.sha256(f)).toBe(first);
    writeFileSync(f, 'second, longer');
    expect(await again.sha256(f)).toBe(execFileSync('sha256sum', [f], { encoding: 'utf8' }).split(' ')[0]);
  });

  it('a memo whose entries are not sha256 digests is not trusted: the file is hashed again', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-memo-'));
    const f = join(dir, 'hc.nc');
    writeFileSync(f, 'content');
    const memo = await openChecksumMemo(dir);
    await memo.sha256(f);
    await memo.save();
    const file = join(dir, 'file-sha256.json');
    const stored = JSON.parse(readFileSync(file, 'utf8')) as Record<string, string>;
    writeFileSync(file, JSON.stringify(Object.fromEntries(Object.keys(stored).map((k) => [k, 'not-a-digest']))));
    expect(await (await openChecksumMemo(dir)).sha256(f)).toBe(execFileSync('sha256sum', [f], { encoding: 'utf8' }).split(' ')[0]);
  });
});
