/**
 * Generates the invented Veloria sample scenario (see sample-inputs/README.md): CF-1.8 NetCDF classic
 * ensemble forecasts for three tiers, their 20-year hindcasts, and gridded synthetic observations.
 * Deterministic: the same seed gives byte-identical files.
 *
 *   npm run sample [-- --out DIR] [-- --seed N]
 */
import { mkdir, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { writeEnsembleFile, writeObservedFile, type CfFileDef } from './cf-gridded-file.ts';
import type { CfVariableDef } from './cf-variables.ts';
import type { NcFormat } from './netcdf-classic-writer.ts';
import { describeCells, veloriaGrid } from './veloria-climate.ts';
import { createTruth, dayNumberOf, fillMember, observedFiller, type ModelTraits, type TruthHistory } from './veloria-weather.ts';
import { packagePath } from '../core/package-root.ts';

export interface SampleOptions {
  /** Random seed (default 20261126). */
  readonly seed?: number;
  /** Hindcast years (start 11-26 of each), default 2006..2025; observations start on 1 January of the first. */
  readonly hindcastYears?: readonly number[];
  /** Progress lines (default: none). */
  readonly onProgress?: (line: string) => void;
}

export interface SampleSummary {
  readonly outDir: string;
  readonly files: readonly { readonly path: string; readonly bytes: number }[];
  readonly totalBytes: number;
  readonly seconds: number;
}

interface SampleSource {
  readonly dir: string;
  readonly prefix: string;
  readonly title: string;
  readonly resolutionDeg: number;
  readonly days: number;
  readonly members: number;
  readonly hindcastMembers: number;
  readonly format: NcFormat;
  readonly packTemperatures: boolean;
  readonly traits: ModelTraits;
  readonly issueDates: readonly string[];
  /** Seasonal mimics a forecast centre: stamps at each day's end, no time_bnds, accumulated tp. */
  readonly stamps: 'midday-bounds' | 'day-end';
}

const SOURCES: readonly SampleSource[] = [
  {
    dir: 'short',
    prefix: 'short',
    title: 'short-range ensemble',
    resolutionDeg: 0.5,
    days: 15,
    members: 50,
    hindcastMembers: 10,
    format: 'classic',
    packTemperatures: true,
    traits: { biasK: 0.3, precipFactor: 1.1, precip: 'flux' },
    issueDates: ['2026-11-23', '2026-11-26', '2026-11-30'],
    stamps: 'midday-bounds',
  },
  {
    dir: 'subseasonal',
    prefix: 'subs',
    title: 'sub-seasonal ensemble',
    resolutionDeg: 1,
    days: 46,
    members: 11,
    hindcastMembers: 11,
    format: '64bit-offset',
    packTemperatures: false,
    traits: { biasK: -0.4, precipFactor: 0.9, precip: 'flux' },
    issueDates: ['2026-11-23', '2026-11-26', '2026-11-30'],
    stamps: 'midday-bounds',
  },
  {
    dir: 'seasonal',
    prefix: 'seas',
    title: 'seasonal ensemble',
    resolutionDeg: 2,
    days: 184,
    members: 25,
    hindcastMembers: 10,
    format: '64bit-offset',
    packTemperatures: true,
    traits: { biasK: 0.6, precipFactor: 1, precip: 'accumulated' },
    issueDates: ['2026-11-26'],
    stamps: 'day-end',
  },
];
const HINDCAST_MMDD = '11-26';
const OBSERVED_LAST_DAY = '2026-11-29';
const DEFAULT_YEARS = Array.from({ length: 20 }, (_, i) => 2006 + i);

const TEMPERATURE_PACKING = { scaleFactor: 0.01, addOffset: 300 };

function variablesOf(packTemperatures: boolean, precip: ModelTraits['precip']): CfVariableDef[] {
  const packing = packTemperatures ? TEMPERATURE_PACKING : undefined;
  const precipDef: CfVariableDef =
    precip === 'flux'
      ? {
          name: 'pr',
          standardName: 'precipitation_flux',
          longName: 'Precipitation (daily mean rate)',
          units: 'kg m-2 s-1',
          cellMethods: 'time: mean',
        }
      : {
          name: 'tp',
          standardName: 'lwe_thickness_of_precipitation_amount',
          longName: 'Total precipitation accumulated from the forecast reference time to the end of the day',
          units: 'm',
          extra: { comment: 'Accumulated since forecast_reference_time: daily amount = tp[t] - tp[t-1] (tp[0] for the first day).' },
        };
  return [
    {
      name: 'tasmax',
      standardName: 'air_temperature',
      longName: 'Daily maximum near-surface air temperature',
      units: 'K',
      cellMethods: 'time: maximum',
      packing,
    },
    {
      name: 'tasmin',
      standardName: 'air_temperature',
      longName: 'Daily minimum near-surface air temperature',
      units: 'K',
      cellMethods: 'time: minimum',
      packing,
    },
    {
      name: 'tdps',
      standardName: 'dew_point_temperature',
      longName: 'Daily mean near-surface dew point temperature',
      units: 'K',
      cellMethods: 'time: mean',
      packing,
    },
    precipDef,
  ];
}

const compact = (iso: string): string => iso.replaceAll('-', '');
const utcDate = (iso: string): Date => new Date(`${iso}T00:00:00Z`);

function globalAttributes(title: string, seed: number): Record<string, string> {
  return {
    title: `Veloria ${title} (synthetic)`,
    institution: 'Forelight sample generator',
    source: 'sample-inputs/generate.ts: invented climate of the fictional Republic of Veloria',
    comment:
      'Invented data for the Forelight demo only. Veloria and its regions do not exist; no real observations or model output are used.',
    history: `generated by sample-inputs/generate.ts with seed ${seed}`,
  };
}

/** Generates every sample file into `outDir` and writes `manifest.json` there last (its presence = complete). */
export async function generateSample(outDir: string = packagePath('sample-inputs/data'), opts: SampleOptions = {}): Promise<SampleSummary> {
  const began = performance.now();
  const seed = opts.seed ?? 20261126;
  const years = opts.hindcastYears ?? DEFAULT_YEARS;
  const truth: TruthHistory = createTruth(seed);
  await mkdir(outDir, { recursive: true });
  await rm(join(outDir, 'manifest.json'), { force: true });
  const files: { path: string; bytes: number }[] = [];
  const note = (path: string, bytes: number): void => {
    files.push({ path, bytes });
    opts.onProgress?.(`${path} ${(bytes / 1e6).toFixed(1)} MB`);
  };
  for (const src of SOURCES) {
    const grid = veloriaGrid(src.resolutionDeg);
    const geography = describeCells(grid);
    const variables = variablesOf(src.packTemperatures, src.traits.precip);
    const runs = [
      ...src.issueDates.map((date) => ({
        date,
        rel: join(src.dir, `${src.prefix}_${compact(date)}.nc`),
        members: src.members,
        kind: 'forecast',
      })),
      ...years.map((y) => ({
        date: `${y}-${HINDCAST_MMDD}`,
        rel: join(src.dir, 'hindcast', `${src.prefix}_${y}${compact(HINDCAST_MMDD)}.nc`),
        members: src.hindcastMembers,
        kind: 'hindcast',
      })),
    ];
    await mkdir(join(outDir, src.dir, 'hindcast'), { recursive: true });
    for (const run of runs) {
      const def: CfFileDef = {
        format: src.format,
        grid,
        start: utcDate(run.date),
        days: src.days,
        stamps: src.stamps,
        variables,
        globalAttributes: globalAttributes(`${src.title} ${run.kind} from ${run.date}`, seed),
      };
      const spec = { geography, start: dayNumberOf(run.date), days: src.days, traits: src.traits };
      const cells = geography.cells * src.days;
      const all = variables.map(() => new Float32Array(run.members * cells));
      for (let m = 0; m < run.members; m++)
        fillMember(
          truth,
          spec,
          seed,
          run.rel,
          m,
          all.map((a) => a.subarray(m * cells, (m + 1) * cells)),
        );
      const bytes = await writeEnsembleFile(join(outDir, run.rel), def, run.members, (t, out) => {
        for (let v = 0; v < all.length; v++) {
          for (let m = 0; m < run.members; m++)
            out[v].set(all[v].subarray(m * cells + t * geography.cells, m * cells + (t + 1) * geography.cells), m * geography.cells);
        }
      });
      note(run.rel, bytes);
    }
  }
  const obsGrid = veloriaGrid(1);
  const obsStart = `${Math.min(...years)}-01-01`;
  const obsDays = dayNumberOf(OBSERVED_LAST_DAY) - dayNumberOf(obsStart) + 1;
  const obsRel = join('observed', 'observed_daily.nc');
  await mkdir(join(outDir, 'observed'), { recursive: true });
  const obsDef: CfFileDef = {
    format: '64bit-offset',
    grid: obsGrid,
    start: utcDate(obsStart),
    days: obsDays,
    variables: variablesOf(false, 'flux'),
    globalAttributes: globalAttributes('gridded daily observations', seed),
  };
  note(
    obsRel,
    await writeObservedFile(join(outDir, obsRel), obsDef, observedFiller(truth, describeCells(obsGrid), dayNumberOf(obsStart), seed)),
  );
  const totalBytes = files.reduce((s, f) => s + f.bytes, 0);
  await writeFile(join(outDir, 'manifest.json'), `${JSON.stringify({ generator: 'src/sample/generate.ts', seed, files }, null, 2)}\n`);
  return { outDir, files, totalBytes, seconds: (performance.now() - began) / 1000 };
}
