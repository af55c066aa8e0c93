/**
 * File cache of skill reports and model climates (with file-checksums.ts, the only I/O of the calibrate stage). The key is the sha256 of the hindcast files'
 * contents, the observations file's contents, a configuration fingerprint and the cache format version; a changed
 * input gives a new key, so stale entries are never read (checksums are remembered per path, size and
 * modification time, see file-checksums.ts). Entries are JSON files
 * `<cacheDir>/skill-<key>.json`, written to a temporary name and renamed (a crash never leaves half a file).
 * Non-finite numbers are stored as {"$num": "NaN" | "Infinity" | "-Infinity"}.
 */
import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { writeFileAtomic } from '../core/write-atomic.ts';
import { join } from 'node:path';
import { describeError } from '../core/errors.ts';
import { sha256File, type ChecksumMemo } from '../core/file-checksums.ts';
import { isRecord, parseShaped, type ShapeCheck } from '../core/json-shape.ts';
import { pairKey, type PairKey } from '../core/keys.ts';
import type { SourceConfig } from '../config/types.ts';
import type { IsoDate } from '../types.ts';
import { observedContext, type CalibrateContext } from './model-climate.ts';
import type { IndicatorClimate } from './stored-climate.ts';
import { localCalibrator, regionJobs } from './region-calibration.ts';
import { tierPairs, type StartReduction } from './start-reduction.ts';
import { fromStored, isStoredClimates, type StoredClimate } from './stored-climate.ts';

/**
 * 10: month leads of model-calendar daily data are model months (LeadWindow.modelMonth). 11: lead values as base64
 * doubles. 12: trend-aware climates carry the year they are re-centred on (LeadClimate.recentreOn). 13: a trend
 * is applied only when told from zero (trend-climate.ts), so skill measured on a re-centred climate changes.
 */
export const SKILL_CACHE_VERSION = 13;

/** sha256 over the files' contents in the given order (streamed, never a whole file in memory); paths do not count. */
export async function hashFiles(paths: readonly string[], memo?: ChecksumMemo): Promise<string> {
  const h = createHash('sha256');
  for (const path of paths) h.update(`${memo ? await memo.sha256(path) : await sha256File(path)}\n`);
  return h.digest('hex');
}

/** sha256 of a JSON value with object keys sorted (order-independent configuration fingerprint). */
export function fingerprint(value: unknown): string {
  const canon = (v: unknown): unknown =>
    Array.isArray(v)
      ? v.map(canon)
      : isRecord(v)
        ? Object.fromEntries(
            Object.keys(v)
              .sort()
              .map((k) => [k, canon(v[k])]),
          )
        : v;
  return createHash('sha256')
    .update(JSON.stringify(canon(value)))
    .digest('hex');
}

/** Cache key for one skill computation. */
export async function skillCacheKey(input: {
  hindcastFiles: readonly string[];
  observationsFile: string | null;
  configFingerprint: string;
  memo?: ChecksumMemo;
}): Promise<string> {
  const files = await hashFiles(input.hindcastFiles, input.memo);
  const obs = input.observationsFile ? await hashFiles([input.observationsFile], input.memo) : 'none';
  return createHash('sha256').update(`v${SKILL_CACHE_VERSION}\n${files}\n${obs}\n${input.configFingerprint}`).digest('hex');
}

export const encode = (_k: string, v: unknown): unknown => (typeof v === 'number' && !Number.isFinite(v) ? { $num: String(v) } : v);
const NON_FINITE: Readonly<Record<string, number>> = { NaN, Infinity, '-Infinity': -Infinity };
/**
 * `value` (parsed JSON) with every {"$num": "NaN" | "Infinity" | "-Infinity"} turned back into its number, bottom-up
 * as a JSON.parse reviver would, but in place: a reviver called for each of the millions of values of an entry took
 * longer than the parse. Any other {"$num": …} stays an object, so the shape check refuses it.
 */
export function decode(value: unknown): unknown {
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) if (value[i] !== null && typeof value[i] === 'object') value[i] = decode(value[i]);
    return value;
  }
  if (!isRecord(value)) return value;
  for (const k of Object.keys(value)) value[k] = decode(value[k]);
  const keys = Object.keys(value);
  const num = value.$num;
  return keys.length === 1 && typeof num === 'string' && Object.hasOwn(NON_FINITE, num) ? NON_FINITE[num] : value;
}

/**
 * The cached value for `key`, or else `compute()` stored under `key`. `shape` checks an entry as read back (non-finite
 * numbers decoded from their {"$num": …} form, so `shape` is made with `nonFinite`); an unreadable, corrupt or
 * misshapen entry is recomputed and overwritten (`note` says so).
 */
export async function cachedSkill<T>(
  cacheDir: string,
  key: string,
  compute: () => T | Promise<T>,
  shape: ShapeCheck<T>,
): Promise<{ value: T; fromCache: boolean; note: string }> {
  const file = join(cacheDir, `skill-${key}.json`);
  let note = '';
  const text = await readFile(file, 'utf8').catch((err: NodeJS.ErrnoException) => {
    if (err.code !== 'ENOENT') note = `skill cache entry ${file} unreadable (${err.message}); recomputed`;
    return null;
  });
  if (text !== null) {
    const checked = parseShaped(text, (parsed) => shape(decode(parsed)));
    if (checked.ok) return { value: checked.value, fromCache: true, note };
    note = `skill cache entry ${file} unreadable (${checked.why}); recomputed`;
  }
  const value = await compute();
  try {
    writeFileAtomic(file, JSON.stringify(value, encode), 'calibrate');
  } catch (err) {
    // The run goes on with the computed value; the next run computes it again.
    note = [note, `skill cache not kept: ${describeError(err)}`].filter(Boolean).join('; ');
  }
  return { value, fromCache: false, note };
}

/** The population raster's sha256 (a changed raster changes population-weighted climates); 'unreadable' when it cannot be read. */
function rasterChecksum(ctx: CalibrateContext, file: string): Promise<string> {
  return ctx.checksums.sha256(file).catch(() => 'unreadable');
}

/**
 * The model climate of every region × indicator of one source's tier: from the cache when the hindcast and
 * observation files, the configuration and the forecast's lead 1 are unchanged, else `reduceStarts()` (every
 * hindcast start read and reduced, in start order) and each region calibrated (`ctx.calibrateRegion`, default in
 * this process; region-calibration.ts), stored. `forecastLeadOne(region, indicator)` is the first day of the forecast's lead 1
 * of that pair (null without one).
 */
export async function cachedClimates(
  ctx: CalibrateContext,
  source: SourceConfig,
  hindcastFiles: readonly string[],
  reduceStarts: () => Promise<readonly StartReduction[]>,
  forecastLeadOne: (region: string, indicator: string) => IsoDate | null,
): Promise<{ climates: Map<PairKey, IndicatorClimate>; fromCache: boolean; cacheNote: string }> {
  const { config } = ctx;
  if (hindcastFiles.length === 0) return { climates: new Map(), fromCache: false, cacheNote: '' };
  const key = await skillCacheKey({
    hindcastFiles,
    observationsFile: ctx.observationsPath,
    configFingerprint: fingerprint({
      source: { id: source.id, tier: source.tier, hindcast: source.hindcast, variables: source.variables },
      regions: config.regions,
      indicators: config.indicators,
      rules: config.rules,
      gate: config.decision.skillGate,
      calibration: config.calibration,
      forecastLeadOne: tierPairs(config, source.tier).map(({ region, ind }) => forecastLeadOne(region.id, ind.id)),
      population: config.population ? { ...config.population, sha256: await rasterChecksum(ctx, config.population.file) } : null,
    }),
    memo: ctx.checksums,
  });
  const compute = async (): Promise<StoredClimate[]> => {
    const jobs = regionJobs(config, source, await reduceStarts(), observedContext(ctx), forecastLeadOne);
    const calibrate = ctx.calibrateRegion ?? localCalibrator;
    const out: StoredClimate[][] = new Array(jobs.length);
    let next = 0;
    const lane = async (): Promise<void> => {
      for (let i = next++; i < jobs.length; i = next++) out[i] = await calibrate(jobs[i]);
    };
    await Promise.all(Array.from({ length: Math.max(1, Math.min(calibrate.parallel ?? 1, jobs.length)) }, lane));
    return out.flat(); // region order, as one pass over the pairs gives them
  };
  const cached = await cachedSkill<StoredClimate[]>(config.calibration.cacheDir, key, compute, isStoredClimates);
  const climates = new Map(
    cached.value.map(({ region, indicator, ...c }) => [
      pairKey(region, indicator),
      { ...c, hindcast: fromStored(c.hindcast), observed: fromStored(c.observed) },
    ]),
  );
  return { climates, fromCache: cached.fromCache, cacheNote: cached.note };
}
