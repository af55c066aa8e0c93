/**
 * CF `cell_methods` (Eaton et al., CF Conventions 1.11, §7.3): "name: [name: …] method [(interval: value unit)]".
 * §7.3.2 defines `interval` as the spacing of the original data the method was applied to; when it is not
 * shorter than the file's own time spacing it is the period each value covers (how converted GRIB files
 * write e.g. "time: maximum (interval: 6 hours)"), see daily.ts.
 */
import type { VariableInfo } from './dataset.ts';
import type { TimeAxis } from './time-axis-shape.ts';

export interface CellMethod {
  readonly names: readonly string[];
  readonly method: string;
  /** The `(interval: …)` text, when given. */
  readonly interval: string | null;
}

/** Parses a CF `cell_methods` string ("area: mean time: maximum (interval: 6 hours)") into name lists and methods. */
export function parseCellMethods(text: string): CellMethod[] {
  const out: CellMethod[] = [];
  const re = /((?:[A-Za-z_][\w]*:\s*)+)([A-Za-z_]+)\s*(\([^)]*\))?/g;
  for (let m = re.exec(text); m !== null; m = re.exec(text)) {
    const names = m[1]
      .split(':')
      .map((s) => s.trim())
      .filter((s) => s !== '');
    const interval = m[3] ? (/interval:\s*([^)]*?)\s*(?:comment:|\)|$)/i.exec(m[3])?.[1] ?? null) : null;
    out.push({ names, method: m[2], interval });
  }
  return out;
}

function timeEntry(info: VariableInfo, time: TimeAxis | null): CellMethod | undefined {
  const text = info.attributes.cell_methods;
  if (typeof text !== 'string') return undefined;
  const names = new Set(['time', ...(time ? [time.variable, time.dimension] : [])]);
  return parseCellMethods(text).find((c) => c.names.some((n) => names.has(n)));
}

/** The CF method applied along time to `info` (`point`, `maximum`, `minimum`, `mean`, `sum`, …), or null when unstated. */
export function timeCellMethod(info: VariableInfo, time: TimeAxis | null): string | null {
  return timeEntry(info, time)?.method ?? null;
}

const INTERVAL_UNIT_MS: Readonly<Record<string, number>> = {
  s: 1000,
  sec: 1000,
  second: 1000,
  seconds: 1000,
  min: 60_000,
  minute: 60_000,
  minutes: 60_000,
  h: 3_600_000,
  hr: 3_600_000,
  hrs: 3_600_000,
  hour: 3_600_000,
  hours: 3_600_000,
  d: 86_400_000,
  day: 86_400_000,
  days: 86_400_000,
};

/** The `(interval: …)` of the time entry in ms, or null when absent or not a fixed-length unit (months, years). */
export function timeCellIntervalMs(info: VariableInfo, time: TimeAxis | null): number | null {
  const text = timeEntry(info, time)?.interval;
  const m = text ? /^(\d+(?:\.\d+)?)\s*([A-Za-z]+)$/.exec(text) : null;
  const unit = m ? INTERVAL_UNIT_MS[m[2].toLowerCase()] : undefined;
  return m && unit !== undefined ? Number(m[1]) * unit : null;
}
