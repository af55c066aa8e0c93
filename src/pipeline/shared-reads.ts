/**
 * Read-once across configurations: configurations issued together (`forelight run --config A --config B …`, the
 * continental bench) that read the same file with the same variables, reference time and tier share ONE extraction
 * over the union of their regions; each configuration gets exactly the series and problems of its own regions.
 *
 * Which configurations take part in a file's read: those not finished whose source patterns (forecast or hindcast
 * files) or observations path give that file with the same variables. A region that two configurations define alike
 * (same id, shape, cell rule and clock) is read once; two different regions under one id are read in separate
 * layers of the same file (one extraction each), so every problem still names the region as its YAML does. A
 * result is kept until every taking part configuration took it or finished, then dropped.
 */
import type { Config, RegionConfig } from '../config/types.ts';
import type { ForelightError } from '../core/errors.ts';
import type { ExtractRequest, ExtractResult, Extractor } from '../read/extract.ts';
import { entriesOf } from '../core/typed-entries.ts';

export interface SharedReads {
  /** The extractor of configuration `index` (its position in the list given to `shareReads`). */
  forConfig(index: number): Extractor;
  /** Configuration `index` is done: reads started later leave its regions out and no result waits for it. */
  finished(index: number): void;
}

interface Entry {
  readonly layers: readonly (readonly RegionConfig[])[];
  readonly results: Promise<ExtractResult[]>;
  /** Configurations that take part and have not taken the result yet. */
  readonly waiting: Set<number>;
}

const readKeys = new WeakMap<RegionConfig, string>();

/**
 * What of a region the read depends on (not its name or teams); computed once per region object, since a polygon's
 * JSON is long and every share looks each region up (serialising it per lookup took 0.4 of 3.4 CPU-s of the warm
 * continental run at scale 0.1).
 */
function readKey(r: RegionConfig): string {
  let key = readKeys.get(r);
  if (key === undefined) {
    key = JSON.stringify([r.id, r.shape, r.cellRule ?? 'overlap', r.timeZone ?? r.utcOffsetHours]);
    readKeys.set(r, key);
  }
  return key;
}

const sortedJson = (q: ExtractRequest['quantities']): string => JSON.stringify(Object.entries(q).sort(([a], [b]) => a.localeCompare(b)));

/** A `{date}`/`{year}{mmdd}` file pattern as a whole-path regular expression. */
function patternRegex(pattern: string): RegExp {
  const parts = pattern.split(/\{[a-z]+\}/);
  return new RegExp(`^${parts.map((p) => p.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')).join('[^/]+?')}$`);
}

/** Every (quantity, variable) pair of `wanted` is one of `mapping`'s (a read of some of a source's variables). */
const mapsAll = (wanted: ExtractRequest['quantities'], mapping: ExtractRequest['quantities']): boolean =>
  entriesOf(wanted).every(([q, v]) => mapping[q] === v);

/** Whether `config` reads `path` with these variables (a forecast, hindcast or its observations, or part of one). */
function readsFile(config: Config, path: string, wanted: ExtractRequest['quantities']): boolean {
  if (config.observations?.path === path && mapsAll(wanted, config.observations.variables)) return true;
  return config.sources.some(
    (s) => mapsAll(wanted, s.variables) && [...s.forecast, s.hindcast].some((p) => p !== undefined && patternRegex(p).test(path)),
  );
}

/** Union of the regions in layers with unique ids; identical regions once. */
function layered(regionSets: readonly (readonly RegionConfig[])[]): RegionConfig[][] {
  const layers: { ids: Map<string, string>; regions: RegionConfig[] }[] = [];
  for (const regions of regionSets) {
    for (const r of regions) {
      const key = readKey(r);
      if (layers.some((l) => l.ids.get(r.id) === key)) continue;
      let layer = layers.find((l) => !l.ids.has(r.id));
      if (!layer) layers.push((layer = { ids: new Map(), regions: [] }));
      layer.ids.set(r.id, key);
      layer.regions.push(r);
    }
  }
  return layers.map((l) => l.regions);
}

/** The part of a shared read that belongs to `regions`: their series, the file's problems and theirs. */
function share(entry: Entry, results: readonly ExtractResult[], regions: readonly RegionConfig[]): ExtractResult {
  const series: ExtractResult['series'][number][] = [];
  const problems: ForelightError[] = [];
  const notes = new Set<string>();
  const seen = new Set<ForelightError | string>();
  const used = new Set<number>();
  for (const r of regions) {
    const key = readKey(r);
    const at = entry.layers.findIndex((l) => l.some((x) => readKey(x) === key));
    used.add(at);
    series.push(...results[at].series.filter((s) => s.region === r.id));
    for (const p of results[at].problems) if (p.diagnostic.place.region === r.id && !seen.has(p)) (seen.add(p), problems.push(p));
  }
  for (const at of [...used].sort()) {
    for (const p of results[at].problems) {
      const text = p.message;
      if (p.diagnostic.place.region !== undefined || seen.has(text)) continue; // a file-level problem once, not per layer
      seen.add(text);
      problems.push(p);
    }
    for (const n of results[at].notes) notes.add(n);
  }
  return { series, problems, notes: [...notes] };
}

export function shareReads(configs: readonly Config[], extract: Extractor): SharedReads {
  const entries = new Map<string, Entry>();
  const done = new Set<number>();
  const release = (key: string, entry: Entry, index: number): void => {
    entry.waiting.delete(index);
    if (entry.waiting.size === 0 && entries.get(key) === entry) entries.delete(key);
  };

  const forConfig = (index: number): Extractor => {
    const own = (async (path: string, request: ExtractRequest): Promise<ExtractResult> => {
      const { regions, ...rest } = request;
      const quantities = sortedJson(request.quantities);
      const key = JSON.stringify([path, quantities, rest.referenceTime ?? null, rest.tier ?? null]); // not the weights cache: it only saves work
      let entry = entries.get(key);
      if (!entry) {
        const takers = configs.flatMap((c, i) => (i === index || (!done.has(i) && readsFile(c, path, request.quantities)) ? [i] : []));
        const layers = layered([regions, ...takers.map((i) => configs[i].regions)]);
        const results = Promise.all(layers.map((l) => extract(path, { ...rest, regions: l })));
        entry = { layers, results, waiting: new Set(takers) };
        entries.set(key, entry);
        const settled = entry;
        results.catch(() => entries.get(key) === settled && entries.delete(key)); // a failed read is tried again
      }
      try {
        const known = new Set(entry.layers.flat().map(readKey));
        const missing = regions.filter((r) => !known.has(readKey(r)));
        const part = share(
          entry,
          await entry.results,
          regions.filter((r) => known.has(readKey(r))),
        );
        if (missing.length === 0) return part;
        // Started by a configuration that did not expect this one (another region list): its other regions read now.
        const late = await extract(path, { ...rest, regions: missing });
        return { series: [...part.series, ...late.series], problems: [...part.problems, ...late.problems], notes: part.notes };
      } finally {
        release(key, entry, index);
      }
    }) as Extractor;
    if (extract.parallel !== undefined) Object.defineProperty(own, 'parallel', { value: extract.parallel });
    return own;
  };

  return {
    forConfig,
    finished(index) {
      done.add(index);
      for (const [key, entry] of entries) release(key, entry, index);
    },
  };
}
