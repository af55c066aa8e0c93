/**
 * Cron expressions: validation and the next firing instants in an IANA time zone.
 * Fields are parsed and matched by croner (Hexagon/croner): 5 fields, or 6 with seconds first; numbers, names,
 * ranges, steps and lists. Day-of-month and day-of-week combine as in classic cron: when both are restricted
 * (neither is `*`), a day matches if EITHER matches (POSIX crontab, IEEE Std 1003.1-2017; Vixie cron), croner's
 * `domAndDow: false`. croner's extensions (L, W, #, ?, + and a year field) are refused so that an expression means
 * the same as in a system crontab.
 * Slots are computed as local wall-clock times (croner in UTC, where no clock jumps) and each wall time becomes an
 * instant with Temporal's "compatible" disambiguation (ECMAScript Temporal proposal, ZonedDateTime): a time skipped
 * by a spring-forward gap runs once, shifted forward by the gap (02:30 → 03:30 new time); a time repeated at
 * fall-back runs once, at the first occurrence. (croner's own zone handling runs a skipped time at the end of the
 * gap, 03:00, and interval jobs twice in a repeated hour; one bulletin slot must stay one run.)
 */
import { Cron, type CronOptions } from 'croner';
import cron from 'node-cron';
import { ConfigError } from './errors.ts';
import { diagnostic } from './diagnostics.ts';
import { zoneOffsetMs } from './local-clock.ts';

/** What is wrong with time zone `tz` and what to write instead, or null when this Node knows the IANA zone. */
export function timeZoneProblem(tz: string): { message: string; fix: string } | null {
  try {
    zoneOffsetMs(tz, 0);
    return null;
  } catch {
    return { message: `unknown IANA time zone "${tz}"`, fix: 'use a zone name such as Etc/GMT-1 (fixed UTC+1) or Africa/Lagos' };
  }
}

/** Throws a one-line ConfigError unless `tz` is an IANA zone this Node knows. */
export function checkTimeZone(tz: string): void {
  const p = timeZoneProblem(tz);
  if (p) throw new ConfigError([diagnostic('config-value', `schedule.timezone: ${p.message}`, p.fix, { pointer: '/schedule/timezone' })]);
}

/** The instant of a local wall time (given as a UTC-based ms "wall" value) in zone `tz`, "compatible" disambiguation. */
export function wallTimeToInstant(tz: string, wallMs: number): number {
  const before = zoneOffsetMs(tz, wallMs - 86_400_000);
  const after = zoneOffsetMs(tz, wallMs + 86_400_000);
  const candidates = [wallMs - before, wallMs - after].filter((t) => zoneOffsetMs(tz, t) === wallMs - t);
  if (candidates.length > 0) return Math.min(...candidates);
  return wallMs - before; // in a gap: keep the offset in force before it, i.e. move forward by the gap
}

/** Classic cron as croner reads it, matched on the wall clock (UTC has no clock changes). */
const CLASSIC: CronOptions = { mode: '5-or-6-parts', domAndDow: false, timezone: 'Etc/UTC', paused: true };

const FORM_FIX = 'use 5 fields (min hour day month weekday) or 6 with seconds first, e.g. "30 7 * * 1,4" for Monday and Thursday 07:30';

/** Day-of-month and day-of-week fields with the weekday names taken out (WED holds a W, names are fine). */
function dayFields(expr: string): string {
  const parts = expr.trim().split(/\s+/);
  return [parts[parts.length - 3], parts[parts.length - 1]]
    .join(' ')
    .toUpperCase()
    .replace(/SUN|MON|TUE|WED|THU|FRI|SAT/g, '');
}

/**
 * What is wrong with a cron expression and what to write instead, or null when the service can schedule it.
 * `forelight check` and the service both ask this.
 */
export function cronProblem(expr: string): { message: string; fix: string } | null {
  let job: Cron;
  try {
    job = new Cron(expr, CLASSIC);
  } catch {
    return { message: `"${expr}" is not a valid cron expression`, fix: FORM_FIX };
  }
  if (!expr.trim().startsWith('@')) {
    const days = dayFields(expr);
    if (/[LW#]/.test(days))
      return { message: `"${expr}" uses L, W or # day tokens, which Forelight does not schedule`, fix: 'list the days instead' };
    if (/[?+]/.test(expr)) {
      return {
        message: `"${expr}" uses ? or +, which classic cron does not have`,
        fix: 'write * for any day; when both day fields are restricted a day matches either (classic cron)',
      };
    }
  }
  if (job.nextRun() === null)
    return { message: `"${expr}" never fires (no month has that day)`, fix: 'check the day of month against the months' };
  return null;
}

/** The expression as a croner job on the wall clock; throws a one-line ConfigError when `cronProblem` finds one. */
function wallClockJob(expr: string): Cron {
  const p = cronProblem(expr);
  if (p) throw new ConfigError([diagnostic('config-value', `schedule.cron: ${p.message}`, p.fix, { pointer: '/schedule/cron' })]);
  return new Cron(expr, CLASSIC);
}

/** Throws a one-line ConfigError naming schedule.cron unless the service can schedule `expr`. */
export function checkCron(expr: string): void {
  wallClockJob(expr);
}

/**
 * Calls `wake` at the slot times of `expr` in zone `tz`: node-cron is the scheduler (never two calls at once).
 * node-cron matches day of month AND day of week where both are restricted and has its own DST handling, so it is
 * only the alarm clock: `wake` must ask computeNextRuns which slot is due, and the service's one-minute backstop
 * catches a slot node-cron does not fire at (an OR-only day, a time in a spring-forward gap).
 */
export function wakeAtSlots(expr: string, tz: string, wake: () => void): { stop(): void } {
  checkCron(expr);
  checkTimeZone(tz);
  const task = cron.schedule(expr, wake, { timezone: tz, name: 'forelight', noOverlap: true });
  return { stop: () => void task.destroy() };
}

/** The first `n` firing instants strictly after `from`. */
export function computeNextRuns(cronExpr: string, tz: string, from: Date, n: number): Date[] {
  const job = wallClockJob(cronExpr);
  checkTimeZone(tz);
  const fromMs = from.getTime();
  // A wall time W runs at W − offset, so the first candidates are after `from` + the smallest offset in force
  // around it (a spring-forward gap just before `from` moves earlier wall times past it).
  const startWall = fromMs + Math.min(zoneOffsetMs(tz, fromMs), zoneOffsetMs(tz, fromMs - 86_400_000));
  const out: Date[] = [];
  let wall: Date | null = new Date(startWall);
  while (out.length < n && (wall = job.nextRun(wall)) !== null) {
    const at = wallTimeToInstant(tz, wall.getTime());
    if (at > (out.at(-1)?.getTime() ?? fromMs)) out.push(new Date(at));
  }
  return out;
}
