/**
 * Next firing times of a cron expression in an IANA time zone, correct across daylight-saving changes.
 * Fields are parsed by node-cron (`cron.parse`); day-of-month and day-of-week combine with AND, as node-cron
 * does. Wall-clock times are resolved to instants like Temporal's "compatible" disambiguation
 * (ECMAScript Temporal proposal, ZonedDateTime): a time skipped by a spring-forward gap runs once, shifted
 * forward by the gap (02:30 → 03:30 new time); a time repeated at fall-back runs once, at the first occurrence.
 * (node-cron itself skips a job whose time falls in the gap; the service uses this computation as the truth.)
 */
import cron, { type ParsedFields } from 'node-cron';
import { ConfigError } from './errors.ts';

const formatters = new Map<string, Intl.DateTimeFormat>();

function zoneFormatter(tz: string): Intl.DateTimeFormat {
  let f = formatters.get(tz);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone: tz, hourCycle: 'h23', year: 'numeric', month: 'numeric', day: 'numeric', hour: 'numeric', minute: 'numeric', second: 'numeric',
    });
    formatters.set(tz, f);
  }
  return f;
}

/** What is wrong with time zone `tz` and what to write instead, or null when this Node knows the IANA zone. */
export function timeZoneProblem(tz: string): { message: string; fix: string } | null {
  try {
    zoneFormatter(tz);
    return null;
  } catch {
    return { message: `unknown IANA time zone "${tz}"`, fix: 'use a zone name such as Etc/GMT-1 (fixed UTC+1) or Africa/Lagos' };
  }
}

/** Throws a one-line ConfigError unless `tz` is an IANA zone this Node knows. */
export function checkTimeZone(tz: string): void {
  const p = timeZoneProblem(tz);
  if (p) throw new ConfigError([`schedule.timezone: ${p.message} — ${p.fix}`]);
}

/** Offset of zone `tz` from UTC at instant `ms`, in milliseconds (local = UTC + offset). */
export function zoneOffsetMs(tz: string, ms: number): number {
  const p: Record<string, number> = {};
  for (const part of zoneFormatter(tz).formatToParts(new Date(ms))) if (part.type !== 'literal') p[part.type] = Number(part.value);
  const asUtc = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
  return asUtc - (ms - (ms % 1000 + 1000) % 1000);
}

/**
 * The instant of a local wall time (given as a UTC-based ms "wall" value) in a zone whose offset at any
 * instant is `offsetAt`, with "compatible" disambiguation.
 */
function resolveWallTime(offsetAt: (ms: number) => number, wallMs: number): number {
  const before = offsetAt(wallMs - 86_400_000);
  const after = offsetAt(wallMs + 86_400_000);
  const candidates = [wallMs - before, wallMs - after].filter((t) => offsetAt(t) === wallMs - t);
  if (candidates.length > 0) return Math.min(...candidates);
  return wallMs - before; // in a gap: keep the offset in force before it, i.e. move forward by the gap
}

export function wallTimeToInstant(tz: string, wallMs: number): number {
  return resolveWallTime((ms) => zoneOffsetMs(tz, ms), wallMs);
}

/**
 * Offset function valid from `lo` to `hi` (instants), assuming at most one offset change in between:
 * the change is found by bisection to the second, so each later lookup costs no Intl call.
 */
function offsetsBetween(tz: string, lo: number, hi: number): (ms: number) => number {
  const offLo = zoneOffsetMs(tz, lo);
  const offHi = zoneOffsetMs(tz, hi);
  if (offLo === offHi) return () => offLo;
  let a = lo;
  let b = hi;
  while (b - a > 1000) {
    const mid = a + Math.floor((b - a) / 2000) * 1000;
    if (zoneOffsetMs(tz, mid) === offLo) a = mid;
    else b = mid;
  }
  return (ms) => (ms < b ? offLo : offHi);
}

/**
 * What is wrong with a cron expression and what to write instead, or null when the service can schedule it: node-cron
 * must accept it and it must not use L, W or # day tokens. `forelight check` and the service both ask this.
 */
export function cronProblem(expr: string): { message: string; fix: string } | null {
  if (!cron.validate(expr)) {
    return { message: `"${expr}" is not a valid cron expression`, fix: 'use 5 fields (min hour day month weekday) or 6 with seconds first, e.g. "30 7 * * 1,4" for Monday and Thursday 07:30' };
  }
  const fields = cron.parse(expr);
  if ([...fields.dayOfMonth, ...fields.dayOfWeek].some((v) => typeof v !== 'number')) {
    return { message: `"${expr}" uses L, W or # day tokens, which Forelight does not schedule`, fix: 'list the days instead' };
  }
  return null;
}

/** The expression's fields; throws a one-line ConfigError when `cronProblem` finds one. */
export function parseCronFields(expr: string): ParsedFields {
  const p = cronProblem(expr);
  if (p) throw new ConfigError([`schedule.cron: ${p.message} — ${p.fix}`]);
  return cron.parse(expr);
}

/** The first `n` firing instants strictly after `from`. */
export function computeNextRuns(cronExpr: string, tz: string, from: Date, n: number): Date[] {
  const f = parseCronFields(cronExpr);
  checkTimeZone(tz);
  const dom = new Set(f.dayOfMonth as number[]);
  const dow = new Set((f.dayOfWeek as number[]).map((d) => d % 7));
  const months = new Set(f.month);
  const { hour: hours, minute: minutes, second: seconds } = f;
  const out: Date[] = [];
  const fromMs = from.getTime();
  // Start one local day early so that a slot shifted across midnight by a DST gap is not missed.
  let day = new Date(fromMs + zoneOffsetMs(tz, fromMs) - 86_400_000);
  day = new Date(Date.UTC(day.getUTCFullYear(), day.getUTCMonth(), day.getUTCDate()));
  for (let i = 0; i < 366 * 8 && out.length < n; i++, day = new Date(day.getTime() + 86_400_000)) {
    if (!months.has(day.getUTCMonth() + 1) || !dom.has(day.getUTCDate()) || !dow.has(day.getUTCDay())) continue;
    const offsetAt = offsetsBetween(tz, day.getTime() - 2 * 86_400_000, day.getTime() + 3 * 86_400_000);
    const steady = offsetAt(day.getTime() - 2 * 86_400_000) === offsetAt(day.getTime() + 3 * 86_400_000);
    const instants: number[] = [];
    for (const h of hours) for (const m of minutes) for (const s of seconds) {
      const wall = day.getTime() + ((h * 60 + m) * 60 + s) * 1000;
      const at = steady ? wall - offsetAt(wall) : resolveWallTime(offsetAt, wall);
      if (at > fromMs) instants.push(at);
      if (steady && instants.length >= n) break; // ascending already: enough for this call
    }
    if (!steady) instants.sort((a, b) => a - b);
    for (const at of instants) {
      const last = out.length > 0 ? out[out.length - 1].getTime() : fromMs;
      if (at > last && out.length < n) out.push(new Date(at));
    }
  }
  return out;
}
