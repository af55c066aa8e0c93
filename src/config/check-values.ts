/** Semantic checks on single values: e-mail addresses, cron expression, time zone, region shapes. */
import { cronProblem, timeZoneProblem } from '../core/next-runs.ts';
import { list, num, obj, text, type RawObject } from './raw-access.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';

/** Deliberately simple (no quoted local parts, no IP literals): local@label.label… */
const EMAIL =
  /^[A-Za-z0-9.!#$%&'*+/=?^_`{|}~-]+@[A-Za-z0-9](?:[A-Za-z0-9-]{0,61}[A-Za-z0-9])?(?:\.[A-Za-z0-9](?:[A-Za-z0-9-]{0,61}[A-Za-z0-9])?)+$/;

export function isEmailAddress(s: string): boolean {
  return EMAIL.test(s) && !s.includes('..');
}

export function checkValues(raw: RawObject): ConfigProblem[] {
  const out: ConfigProblem[] = [];
  const email = (v: unknown, ...path: (string | number)[]) => {
    if (typeof v === 'string' && !isEmailAddress(v))
      out.push(
        problem(pointerOf(...path), `malformed e-mail address "${v}"`, 'write it as name@domain, e.g. duty-officer@health.veloria.example'),
      );
  };
  list(raw.teams).forEach((t, i) => list(obj(t).recipients).forEach((r, j) => email(r, 'teams', i, 'recipients', j)));
  const delivery = obj(raw.delivery);
  email(delivery.from, 'delivery', 'from');
  list(delivery.operators).forEach((r, j) => email(r, 'delivery', 'operators', j));

  const schedule = obj(raw.schedule);
  const cron = text(schedule.cron);
  const cronIssue = cron === undefined ? null : cronProblem(cron);
  if (cronIssue) out.push(problem(pointerOf('schedule', 'cron'), cronIssue.message, cronIssue.fix));
  const tz = text(schedule.timezone);
  const tzIssue = tz === undefined ? null : timeZoneProblem(tz);
  if (tzIssue) out.push(problem(pointerOf('schedule', 'timezone'), tzIssue.message, tzIssue.fix));

  list(raw.regions).forEach((r, i) => out.push(...checkClock(obj(r), i)));
  list(raw.regions).forEach((r, i) => {
    if (obj(r).boundaries === undefined) out.push(...checkShape(obj(r), i));
  });
  return out;
}

/** A region (or region set) gives at most one of time-zone and utc-offset-hours; the zone must be known. */
function checkClock(r: RawObject, i: number): ConfigProblem[] {
  const zone = text(r['time-zone']);
  if (zone !== undefined && r['utc-offset-hours'] !== undefined) {
    return [
      problem(
        pointerOf('regions', i, 'utc-offset-hours'),
        'both time-zone and utc-offset-hours are given',
        'keep one: time-zone follows daylight saving, utc-offset-hours is fixed',
      ),
    ];
  }
  const issue = zone === undefined ? null : timeZoneProblem(zone);
  return issue ? [problem(pointerOf('regions', i, 'time-zone'), issue.message, issue.fix)] : [];
}

function checkShape(r: RawObject, i: number): ConfigProblem[] {
  const at = (...p: (string | number)[]) => pointerOf('regions', i, ...p);
  if ((r.box === undefined) === (r.polygon === undefined)) {
    return [
      problem(
        at(),
        r.box === undefined ? 'region has no shape' : 'region has both box and polygon',
        'give exactly one of box: { south, north, west, east } or polygon: [[lon, lat], ...]',
      ),
    ];
  }
  const out: ConfigProblem[] = [];
  if (r.box !== undefined) {
    const b = obj(r.box);
    const [s, n, w, e] = [num(b.south), num(b.north), num(b.west), num(b.east)];
    if (s !== undefined && n !== undefined && s >= n)
      out.push(problem(at('box', 'north'), `north ${n} is not north of south ${s}`, 'swap south and north'));
    // West > east is a box across the 180° meridian (e.g. 172 → -174), read eastwards from west.
    if (w !== undefined && e !== undefined && w === e)
      out.push(
        problem(
          at('box', 'east'),
          `east ${e} equals west ${w}: the box has no width`,
          'give the eastern edge (a box across 180° has west > east, e.g. west: 172, east: -174)',
        ),
      );
    return out;
  }
  const ring = list(r.polygon).map((p) => list(p));
  const first = ring[0];
  const last = ring[ring.length - 1];
  if (ring.length >= 4 && first && last && (first[0] !== last[0] || first[1] !== last[1])) {
    out.push(
      problem(
        at('polygon', ring.length - 1),
        `polygon is not closed: last point [${last.join(', ')}] differs from the first [${first.join(', ')}]`,
        'repeat the first point at the end',
      ),
    );
  }
  return out;
}
