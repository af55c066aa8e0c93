/**
 * Inputs of the continental bench set (`npm run bench -- --set continental [--scale S]`), generated into
 * bench/data/continental-<S>/ and deleted after the run (unless `--keep`):
 *  - a 0.25° domain of about 80° × 75° (320 × 300 = 96,000 cells at scale 1; S multiplies the cells and the districts),
 *    latitudes descending, longitudes −20…60 °E around 20 °E;
 *  - a 51-member × 46-day forecast of tasmax, tasmin, tdps as classic 64-bit offset, and as NetCDF-4
 *    (Debian `nccopy -k nc4 -d 1 -s`, one chunk per field);
 *  - 20 hindcast years × 25 members on the same grid, one classic file a year;
 *  - for the growth rows, two more classic forecasts on domains of 1/4 and 1/2 the cells (`makeGrowthInputs`).
 * Every field is packed shorts (scale_factor/add_offset, CF 1.8 §8.1), as archives often deliver them; that keeps the
 * full set at about 15 GB (hindcasts 13.2 GB).
 * Values are Forelight's synthetic fields (bench/make-large-inputs.ts): realistic in size and layout only.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { axis, type GridSpec } from '../../src/sample/cf-gridded-file.ts';
import { writeSynthetic } from '../make-large-inputs.ts';
import type { RegionConfig } from '../../src/config/types.ts';
import { inventedDistricts, type DistrictArea } from '../region-weights-bench.ts';

export const FORECAST_MEMBERS = 51;
export const HINDCAST_MEMBERS = 25;
export const HINDCAST_YEARS = 20;
/** Forecast issue date; hindcast starts are the same day of the 20 years before. */
export const ISSUE_DATE = '2026-11-26';
const FULL = { lon: 320, lat: 300, districts: 1000 } as const;
const STEP = 0.25;

/** A domain: its grid, the area the district centres fall in, and how many districts. */
export interface Domain {
  readonly nLat: number;
  readonly nLon: number;
  readonly districts: number;
  readonly area: DistrictArea;
}

/** The domain of `cells` × the full one (sides × √cells), with `regions` × the 1,000 districts (at least 5: one per configuration). */
export function domainAt(cells: number, regions: number): Domain {
  const nLon = Math.max(8, Math.round(FULL.lon * Math.sqrt(cells)));
  const nLat = Math.max(8, Math.round(FULL.lat * Math.sqrt(cells)));
  const [west, north] = [20 - (nLon * STEP) / 2, (nLat * STEP) / 2];
  // Centres kept 1.3° inside the edges: the largest district reaches 1.2° from its centre.
  const margin = Math.min(1.3, (nLat * STEP) / 4);
  return {
    nLat,
    nLon,
    districts: Math.max(5, Math.round(FULL.districts * regions)),
    area: { south: -north + margin, north: north - margin, west: west + margin, east: west + nLon * STEP - margin },
  };
}

export function domainGrid(d: Domain): GridSpec {
  return { lats: axis((d.nLat * STEP) / 2 - STEP / 2, -STEP, d.nLat), lons: axis(20 - (d.nLon * STEP) / 2 + STEP / 2, STEP, d.nLon) };
}

export interface GrowthInput {
  /** Cells × regions relative to the smallest row (1, 4, 16). */
  readonly factor: number;
  readonly domain: Domain;
  readonly classic: string;
}

export interface ContinentalInputs {
  readonly dir: string;
  readonly scale: number;
  readonly domain: Domain;
  readonly classic: string;
  readonly netcdf4: string;
  readonly hindcasts: readonly string[];
  /** `{year}{mmdd}` pattern of the hindcasts, as in a source's hindcast-files. */
  readonly hindcastPattern: string;
}

export const CONFIGURATIONS = 5;

/** The districts of a domain, dealt to the 5 configurations. */
export function continentalDistricts(cells: number, regions: number): RegionConfig[][] {
  const d = domainAt(cells, regions);
  const all = inventedDistricts(d.districts, d.area).map((r) => ({ ...r, cellRule: 'overlap' as const }));
  return Array.from({ length: CONFIGURATIONS }, (_, c) => all.filter((_, i) => i % CONFIGURATIONS === c));
}

export const continentalDir = (scale: number): string => fileURLToPath(new URL(`../data/continental-${scale}`, import.meta.url));

/** Creates (or reuses, when its inputs.json exists) the continental inputs at `scale`. */
export async function makeContinentalInputs(scale: number, log: (line: string) => void): Promise<ContinentalInputs> {
  const dir = continentalDir(scale);
  const manifest = join(dir, 'inputs.json');
  if (existsSync(manifest)) return JSON.parse(await readFile(manifest, 'utf8')) as ContinentalInputs;
  await mkdir(join(dir, 'hindcast'), { recursive: true });
  const domain = domainAt(scale, scale);
  const grid = domainGrid(domain);
  const classic = join(dir, 'forecast_classic.nc');
  log(`writing ${classic} (${domain.nLat} × ${domain.nLon} cells, ${FORECAST_MEMBERS} members)`);
  await writeSynthetic(classic, '64bit-offset', grid, ISSUE_DATE, FORECAST_MEMBERS, true);
  const netcdf4 = join(dir, 'forecast_nc4.nc');
  log(`converting to ${netcdf4} (nccopy -k nc4 -d 1 -s)`);
  execFileSync('nccopy', ['-k', 'nc4', '-d', '1', '-s', '-c', `time/1,number/1,lat/${domain.nLat},lon/${domain.nLon}`, classic, netcdf4]);
  const hindcasts: string[] = [];
  const year = Number(ISSUE_DATE.slice(0, 4));
  for (let y = year - HINDCAST_YEARS; y < year; y++) {
    const path = join(dir, 'hindcast', `hindcast_${y}${ISSUE_DATE.slice(5, 7)}${ISSUE_DATE.slice(8)}.nc`);
    log(`writing ${path} (${HINDCAST_MEMBERS} members, packed shorts)`);
    await writeSynthetic(path, '64bit-offset', grid, `${y}${ISSUE_DATE.slice(4)}`, HINDCAST_MEMBERS, true);
    hindcasts.push(path);
  }
  const inputs: ContinentalInputs = {
    dir,
    scale,
    domain,
    classic,
    netcdf4,
    hindcasts,
    hindcastPattern: join(dir, 'hindcast', 'hindcast_{year}{mmdd}.nc'),
  };
  await writeFile(manifest, `${JSON.stringify(inputs, null, 2)}\n`);
  return inputs;
}

/**
 * The growth rows' forecasts (classic): 1/4 and 1/2 of the cells and districts, and the full one; written after the
 * hindcasts are deleted, so the bench never holds more than forecasts + hindcasts on disk.
 */
export async function makeGrowthInputs(inputs: ContinentalInputs, log: (line: string) => void): Promise<GrowthInput[]> {
  const growth: GrowthInput[] = [];
  for (const [factor, part] of [
    [1, 1 / 4],
    [4, 1 / 2],
  ] as const) {
    const domain = domainAt(inputs.scale * part, inputs.scale * part);
    const classic = join(inputs.dir, `forecast_growth_${factor}.nc`);
    if (!existsSync(classic)) {
      log(`writing ${classic} (${domain.nLat} × ${domain.nLon} cells)`);
      await writeSynthetic(classic, '64bit-offset', domainGrid(domain), ISSUE_DATE, FORECAST_MEMBERS, true);
    }
    growth.push({ factor, domain, classic });
  }
  return [...growth, { factor: 16, domain: inputs.domain, classic: inputs.classic }];
}

// Not when bundled into another entry (import.meta.url is then the bundle's).
if (import.meta.url.endsWith('.ts') && process.argv[1] === fileURLToPath(import.meta.url)) {
  const scale = Number(process.argv[2] ?? 1);
  const inputs = await makeContinentalInputs(scale, (l) => process.stdout.write(`${l}\n`));
  process.stdout.write(`${JSON.stringify(inputs, null, 2)}\n`);
}
