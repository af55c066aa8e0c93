/**
 * One file read of the read stage: a file and a set of regions through an `Extractor` (this process, or a cluster's
 * workers), its series grouped by region and quantity; a file that fails is one problem, never a stopped run.
 */
import type { RegionConfig, SourceConfig } from '../config/types.ts';
import { ForelightError, InputError } from '../core/errors.ts';
import type { Extractor } from '../read/extract.ts';
import type { RegionQuantities, RegionSeries } from '../types.ts';

export interface SourceRead {
  readonly source: SourceConfig;
  readonly date: string;
  readonly path: string;
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

/** Grid cells each region covers in a file (the same for every quantity of one file). */
export function regionCells(series: RegionQuantities): Map<string, number> {
  return new Map([...series].map(([region, byQ]) => [region, [...byQ.values()][0]?.cells ?? 0]));
}
