/**
 * One file read of the read stage: a file and a set of regions through an `Extractor` (this process, or a cluster's
 * workers), its series grouped by region and quantity; a file that fails is one problem, never a stopped run.
 */
import type { PopulationConfig, RegionConfig, SourceConfig } from '../config/types.ts';
import { ForelightError, InputError } from '../core/errors.ts';
import type { Extractor } from '../read/extract.ts';
import type { RegionQuantities, RegionSeries } from '../types.ts';
import { groupInputFiles, type InputFiles } from './split-files.ts';

export interface SourceRead {
  readonly source: SourceConfig;
  readonly date: string;
  readonly path: string;
  /** Every file of the forecast used (one unless it is split by variable or member). */
  readonly files: readonly string[];
  readonly stale: boolean;
  readonly referenceTime: string;
  readonly series: RegionQuantities;
  /** How the forecast file's times were read where a convention decided it (for run.json notes). */
  readonly notes: readonly string[];
}

function group(series: readonly RegionSeries[]): RegionQuantities {
  const out: RegionQuantities = new Map();
  for (const s of series) {
    let byQ = out.get(s.region);
    if (!byQ) out.set(s.region, (byQ = new Map()));
    byQ.set(s.quantity, s);
  }
  return out;
}

/** What one file read needs besides its path: the forecast date (or hindcast start) and the source's tier. */
export interface FileRequest {
  readonly referenceTime?: string;
  readonly tier?: SourceConfig['tier'];
  /** Receives how the file's times were read (model calendar, monthly values). */
  readonly notes?: string[];
  /** Folder of the region-weights cache (calibration.cache-dir), computed once per grid and region set. */
  readonly weightsCacheDir?: string;
  /** The population raster of population-weighted regions (config `population:`). */
  readonly population?: PopulationConfig | null;
  /** Files holding the next members of the same forecast, in member order (split-files.ts). */
  readonly moreMembers?: readonly string[];
  /** A hindcast start inside a file of several starts: its index along the reference-time dimension (hindcast-list.ts). */
  readonly startIndex?: number;
}

export async function readFile(
  extract: Extractor,
  path: string,
  quantities: SourceConfig['variables'],
  regions: readonly RegionConfig[],
  request: FileRequest,
  problems: ForelightError[],
): Promise<RegionQuantities | null> {
  try {
    const r = await extract(path, {
      quantities,
      regions,
      referenceTime: request.referenceTime,
      tier: request.tier,
      weightsCacheDir: request.weightsCacheDir,
      population: request.population ?? null,
      ...(request.moreMembers && request.moreMembers.length > 0 ? { moreMembers: request.moreMembers } : {}),
      ...(request.startIndex !== undefined ? { startIndex: request.startIndex } : {}),
    });
    problems.push(...r.problems);
    request.notes?.push(...r.notes);
    return group(r.series);
  } catch (err) {
    if (err instanceof ForelightError) {
      problems.push(err);
      return null;
    }
    problems.push(
      new InputError(
        'read-failed',
        path,
        `could not be read (${err instanceof Error ? err.message : String(err)})`,
        'check the file; the other sources went on',
      ),
    );
    return null;
  }
}

/**
 * One forecast or hindcast start whose files may be split by variable or member (split-files.ts): each group of
 * files read once, the series merged. A file the patterns ask for that is missing makes the whole forecast
 * unreadable (null, each missing file a problem), as a damaged file does: never a forecast with fewer members.
 */
export async function readInputFiles(
  extract: Extractor,
  files: InputFiles,
  quantities: SourceConfig['variables'],
  regions: readonly RegionConfig[],
  request: FileRequest,
  problems: ForelightError[],
): Promise<RegionQuantities | null> {
  if (files.missing.length > 0) {
    problems.push(...files.missing);
    return null;
  }
  let merged: RegionQuantities | null = null;
  for (const group of await groupInputFiles(files, quantities)) {
    const [first, ...more] = group.files;
    const read = await readFile(extract, first, group.quantities, regions, { ...request, moreMembers: more }, problems);
    if (!read) continue;
    merged ??= new Map();
    for (const [region, byQ] of read) {
      const into = merged.get(region) ?? new Map();
      for (const [q, series] of byQ) into.set(q, series);
      merged.set(region, into);
    }
  }
  return merged;
}

/** Grid cells each region covers in a file (the same for every quantity of one file). */
export function regionCells(series: RegionQuantities): Map<string, number> {
  return new Map([...series].map(([region, byQ]) => [region, [...byQ.values()][0]?.cells ?? 0]));
}
