/**
 * Generates the benchmark inputs into bench/data/<mode>/ (not committed): a global 1.5° ensemble forecast
 * (lat 90→−90, lon 0…358.5, i.e. the 0…360 convention) with float32 tasmax, tasmin, tdps in K, as NetCDF
 * classic 64-bit offset and as NetCDF-4 (deflate level 1 + shuffle, converted by Debian `nccopy`), plus a
 * hindcast set (one classic file per year). Values are smooth synthetic fields with member/day noise —
 * realistic in size, layout and compressibility, meaningless as weather.
 *
 *   node bin/run-ts.mjs bench/make-large-inputs.ts [--small] [--huge]
 *   full:  101 members × 46 days × 121 × 240 (≈ 1.6 GB classic) + 20 hindcast years × 11 members
 *   small:  11 members × 46 days × 121 × 240 (≈ 0.18 GB) + 2 hindcast years × 11 members
 *   --huge: also a CDF-5 file > 4 GiB (101 members × 46 days × 0.75° grid 241 × 480, ≈ 6.4 GB)
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { axis, writeEnsembleFile, type CfFileDef, type GridSpec } from '../src/sample/cf-gridded-file.ts';
import type { NcFormat } from '../src/sample/netcdf-classic-writer.ts';
import { createRandom, deriveSeed } from '../src/sample/seeded-random.ts';

export type BenchMode = 'small' | 'full';

export interface BenchInputs {
  readonly classic: string;
  readonly netcdf4: string;
  readonly hindcasts: readonly string[];
  /** Present with `huge`. */
  readonly huge?: string;
}

const VARIABLES = [
  {
    name: 'tasmax',
    standardName: 'air_temperature',
    longName: 'Daily maximum near-surface air temperature',
    units: 'K',
    cellMethods: 'time: maximum',
    offsetK: 5,
  },
  {
    name: 'tasmin',
    standardName: 'air_temperature',
    longName: 'Daily minimum near-surface air temperature',
    units: 'K',
    cellMethods: 'time: minimum',
    offsetK: -5,
  },
  {
    name: 'tdps',
    standardName: 'dew_point_temperature',
    longName: 'Daily mean near-surface dew point temperature',
    units: 'K',
    cellMethods: 'time: mean',
    offsetK: -8,
  },
];
const SIZES = { small: { members: 11, years: 2 }, full: { members: 101, years: 20 } } as const;
const DAYS = 46;
const HINDCAST_MEMBERS = 11;
const SEED = 46_101;

export const benchDataDir = (mode: BenchMode | 'huge'): string => fileURLToPath(new URL(`./data/${mode}`, import.meta.url));

const globalGrid = (step: number): GridSpec => ({
  lats: axis(90, -step, Math.round(180 / step) + 1),
  lons: axis(0, step, Math.round(360 / step)),
});

/** Short packing of the synthetic temperatures (K): 0.01 K steps around 273.15 K (common practice, no source). */
const KELVIN_SHORTS = { scaleFactor: 0.01, addOffset: 273.15 } as const;

/**
 * Writes one synthetic ensemble file: climatology by latitude and longitude + member/day anomalies + cell noise;
 * float32, or with `packed` shorts with scale_factor/add_offset (CF 1.8 §8.1), as many hindcast archives deliver them.
 */
export async function writeSynthetic(
  path: string,
  format: NcFormat,
  grid: GridSpec,
  start: string,
  members: number,
  packed = false,
): Promise<number> {
  const nLat = grid.lats.length;
  const nLon = grid.lons.length;
  const base = new Float32Array(nLat * nLon);
  for (let y = 0; y < nLat; y++) {
    const coslat = Math.cos((grid.lats[y] * Math.PI) / 180);
    for (let x = 0; x < nLon; x++)
      base[y * nLon + x] = 273.15 - 25 + 52 * coslat ** 1.5 + 4 * Math.sin((grid.lons[x] * Math.PI) / 90) * coslat;
  }
  const rng = createRandom(deriveSeed(SEED, path));
  const def: CfFileDef = {
    format,
    grid,
    start: new Date(`${start}T00:00:00Z`),
    days: DAYS,
    variables: packed ? VARIABLES.map((v) => ({ ...v, packing: KELVIN_SHORTS })) : VARIABLES,
    globalAttributes: {
      title: 'Forelight benchmark input (synthetic)',
      source: 'bench/make-large-inputs.ts',
      comment: 'Synthetic values for timing only.',
    },
  };
  const cells = base.length;
  return writeEnsembleFile(path, def, members, (t, out) => {
    for (let v = 0; v < VARIABLES.length; v++) {
      const field = out[v];
      for (let m = 0; m < members; m++) {
        const shift = VARIABLES[v].offsetK + 2 * (rng.uniform() - 0.5) + 0.05 * t;
        const o = m * cells;
        for (let c = 0; c < cells; c++) field[o + c] = base[c] + shift + 1.5 * (rng.uniform() + rng.uniform() - 1);
      }
    }
  });
}

/** Creates (or reuses, when bench/data/<mode>/inputs.json exists) the benchmark inputs. */
export async function makeBenchInputs(mode: BenchMode, opts: { huge?: boolean; log?: (line: string) => void } = {}): Promise<BenchInputs> {
  const dir = benchDataDir(mode);
  const manifest = join(dir, 'inputs.json');
  const log = opts.log ?? (() => {});
  let inputs: BenchInputs;
  if (existsSync(manifest)) inputs = JSON.parse(await readFile(manifest, 'utf8')) as BenchInputs;
  else {
    await mkdir(join(dir, 'hindcast'), { recursive: true });
    const { members, years } = SIZES[mode];
    const grid = globalGrid(1.5);
    const classic = join(dir, 'forecast_classic.nc');
    log(`writing ${classic}`);
    await writeSynthetic(classic, '64bit-offset', grid, '2026-11-26', members);
    const netcdf4 = join(dir, 'forecast_nc4.nc');
    log(`converting to ${netcdf4} (nccopy -k nc4 -d 1 -s)`);
    execFileSync('nccopy', ['-k', 'nc4', '-d', '1', '-s', '-c', 'time/1,number/1,lat/121,lon/240', classic, netcdf4]);
    const hindcasts: string[] = [];
    for (let y = 2026 - years; y < 2026; y++) {
      const path = join(dir, 'hindcast', `hindcast_${y}1126.nc`);
      log(`writing ${path}`);
      await writeSynthetic(path, '64bit-offset', grid, `${y}-11-26`, HINDCAST_MEMBERS);
      hindcasts.push(path);
    }
    inputs = { classic, netcdf4, hindcasts };
    await writeFile(manifest, `${JSON.stringify(inputs, null, 2)}\n`);
  }
  if (!opts.huge) return inputs;
  const huge = join(benchDataDir('huge'), 'forecast_cdf5.nc');
  if (!existsSync(huge)) {
    await mkdir(benchDataDir('huge'), { recursive: true });
    log(`writing ${huge}`);
    await writeSynthetic(huge, 'cdf5', globalGrid(0.75), '2026-11-26', SIZES.full.members);
  }
  return { ...inputs, huge };
}

// Not when bundled into another entry (import.meta.url is then the bundle's).
if (import.meta.url.endsWith('.ts') && process.argv[1] === fileURLToPath(import.meta.url)) {
  const mode: BenchMode = process.argv.includes('--small') ? 'small' : 'full';
  const inputs = await makeBenchInputs(mode, { huge: process.argv.includes('--huge'), log: (l) => process.stdout.write(`${l}\n`) });
  process.stdout.write(`${JSON.stringify(inputs, null, 2)}\n`);
}
