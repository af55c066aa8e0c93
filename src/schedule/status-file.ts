/** The service status file read by `forelight status`: last run, its result, the next run, failures. */
import { jsonShape, parseShaped } from '../core/json-shape.ts';
import { readFileSync } from 'node:fs';
import { writeFileAtomic } from '../core/write-atomic.ts';
import { ForelightError, describeError, errnoCode } from '../core/errors.ts';
import { exitCodeName } from '../core/exit-codes.ts';

export interface RunReport {
  readonly reason: 'scheduled' | 'catch-up' | 'manual';
  readonly startedAt: string;
  readonly finishedAt: string;
  readonly exitCode: number;
  readonly exitName: string;
  readonly summary: string;
}

export interface ServiceStatus {
  readonly updatedAt: string;
  /** Process that wrote this status (the service, or a manual `forelight run`). */
  readonly pid: number;
  /** Process id of the running service, null after it stopped (or when only manual runs wrote the file). */
  readonly servicePid?: number | null;
  readonly cron: string;
  readonly timezone: string;
  readonly lastRun: RunReport | null;
  readonly nextRun: string | null;
  /** Runs in a row that ended with a code other than ok, inputProblem or nothingNew. */
  readonly consecutiveFailures: number;
  /** The latest failed runs, newest first (at most 10). */
  readonly recentFailures: readonly RunReport[];
}

export function makeRunReport(
  reason: RunReport['reason'],
  startedAt: Date,
  finishedAt: Date,
  exitCode: number,
  summary: string,
): RunReport {
  return {
    reason,
    startedAt: startedAt.toISOString(),
    finishedAt: finishedAt.toISOString(),
    exitCode,
    exitName: exitCodeName(exitCode),
    summary,
  };
}

/** Write atomically (temporary file + rename) so a reader never sees half a file. */
export function writeStatus(path: string, status: ServiceStatus): void {
  writeFileAtomic(path, JSON.stringify(status, null, 2) + '\n', 'schedule');
}

const REPORT = {
  type: 'object',
  required: ['reason', 'startedAt', 'finishedAt', 'exitCode', 'exitName', 'summary'],
  properties: {
    reason: { enum: ['scheduled', 'catch-up', 'manual'] },
    startedAt: { type: 'string' },
    finishedAt: { type: 'string' },
    exitCode: { type: 'integer' },
    exitName: { type: 'string' },
    summary: { type: 'string' },
  },
};
const isStatus = jsonShape<ServiceStatus>({
  type: 'object',
  required: ['updatedAt', 'pid', 'cron', 'timezone', 'lastRun', 'nextRun', 'consecutiveFailures', 'recentFailures'],
  properties: {
    updatedAt: { type: 'string' },
    pid: { type: 'integer' },
    servicePid: { type: ['integer', 'null'] },
    cron: { type: 'string' },
    timezone: { type: 'string' },
    lastRun: { anyOf: [REPORT, { type: 'null' }] },
    nextRun: { type: ['string', 'null'] },
    consecutiveFailures: { type: 'integer', minimum: 0 },
    recentFailures: { type: 'array', items: REPORT },
  },
});

/** Null when the service has not written a status yet. */
export function readStatus(path: string): ServiceStatus | null {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (err) {
    if (errnoCode(err) === 'ENOENT') return null;
    throw new ForelightError('schedule', 'status-read', `cannot read status file ${path}: ${describeError(err)}`, 'check its permissions');
  }
  const status = parseShaped(text, isStatus);
  if (status.ok) return status.value;
  throw new ForelightError(
    'schedule',
    'status-corrupt',
    `status file ${path} is not a status file: ${status.why}`,
    'delete it; the service writes a new one after its next run',
  );
}

/** The status with the service's pid set (at start) or cleared (at stop); the rest is kept. */
export function withServicePid(
  previous: ServiceStatus | null,
  base: Pick<ServiceStatus, 'cron' | 'timezone' | 'nextRun'>,
  servicePid: number | null,
  at: Date,
): ServiceStatus {
  return {
    updatedAt: at.toISOString(),
    pid: process.pid,
    lastRun: null,
    consecutiveFailures: 0,
    recentFailures: [],
    ...previous,
    ...base,
    servicePid,
  };
}

/** "running (pid N)" or why the service is not running, from the status file and a liveness probe of its pid. */
export function describeService(status: ServiceStatus | null, alive: (pid: number) => boolean): string {
  if (!status?.servicePid)
    return `not running (no service has recorded itself${status ? `; last written by process ${status.pid} at ${status.updatedAt}` : ''})`;
  return alive(status.servicePid)
    ? `running (pid ${status.servicePid})`
    : `NOT RUNNING: process ${status.servicePid} recorded at ${status.updatedAt} is gone (crashed or killed) — start it again (systemctl start forelight)`;
}

/** The status after one more run (`base.servicePid` when the service writes it; a manual run keeps the previous one). */
export function nextStatus(
  previous: ServiceStatus | null,
  base: Pick<ServiceStatus, 'cron' | 'timezone' | 'nextRun' | 'servicePid'>,
  run: RunReport,
): ServiceStatus {
  const failed = !['ok', 'nothingNew', 'inputProblem', 'stopped'].includes(run.exitName);
  return {
    updatedAt: run.finishedAt,
    pid: process.pid,
    servicePid: previous?.servicePid ?? null,
    ...base,
    lastRun: run,
    consecutiveFailures: failed ? (previous?.consecutiveFailures ?? 0) + 1 : 0,
    recentFailures: failed ? [run, ...(previous?.recentFailures ?? [])].slice(0, 10) : (previous?.recentFailures ?? []),
  };
}
