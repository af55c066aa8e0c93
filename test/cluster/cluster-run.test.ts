/**
 * Scale-out on real parts, loopback only: Debian's redis-server (BullMQ queue), a throw-away PostgreSQL cluster (the
 * shared ledger) and a real SMTP server. Three `forelight worker` processes read the files of the Veloria sample for a
 * `forelight run --cluster` coordinator; one worker is killed with SIGKILL while it holds a job. The run must complete
 * with the same probabilities and stages as a single-process run on SQLite, and every recipient must get exactly one
 * copy. (BullMQ documents the recovery: a job whose worker stops renewing its lock is "stalled" and moved back to
 * the wait list, docs.bullmq.io "Stalled Jobs".)
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { cpSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseDocument } from 'yaml';
import { EXIT } from '../../src/core/exit-codes.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { startSmtp, type SmtpFixture } from '../deliver/fixtures.ts';
import { startPostgres, startRedis, type TestPostgres, type TestRedis } from '../support/servers.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const CLI = join(ROOT, 'bin/forelight.mjs');
const DATE = '2026-11-26';
const PW_ENV = 'FORELIGHT_TEST_LEDGER_PASSWORD';

let redis: TestRedis;
let postgres: TestPostgres;
let smtp: SmtpFixture;
let sample: string;
const children: ChildProcess[] = [];

/** The shipped configuration in `dir`, pointed at the sample, with its own outputs, ledger and (optionally) SMTP. */
function writeConfig(dir: string, ledger: string, smtpPort: number | null): string {
  cpSync(join(ROOT, 'config'), join(dir, 'config'), { recursive: true });
  const file = join(dir, 'config', 'forelight.yaml');
  const doc = parseDocument(readFileSync(file, 'utf8'));
  const sources = doc.get('sources') as { items: { get(k: string): string; set(k: string, v: string): void }[] };
  for (const s of sources.items) {
    for (const key of ['forecast-files', 'hindcast-files']) s.set(key, s.get(key).replace('../sample-inputs/data', sample));
  }
  doc.setIn(['observations', 'file'], join(sample, 'observed/observed_daily.nc'));
  doc.setIn(['calibration', 'cache-dir'], join(dir, 'cache'));
  doc.setIn(['delivery', 'outbox'], join(dir, 'outbox'));
  doc.setIn(['delivery', 'archive'], join(dir, 'archive'));
  doc.setIn(['delivery', 'retry-base-seconds'], 1);
  if (smtpPort !== null) doc.setIn(['delivery', 'smtp'], doc.createNode({ host: '127.0.0.1', port: smtpPort, security: 'none' }));
  doc.set('ledger', ledger);
  if (ledger.startsWith('postgres')) doc.set('ledger-password-env', PW_ENV);
  doc.set('templates', join(ROOT, 'templates'));
  writeFileSync(file, doc.toString());
  return file;
}

const env = () => ({ ...process.env, [PW_ENV]: postgres.password, FORELIGHT_LOG_LEVEL: 'info' });

function cli(args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [CLI, ...args], { cwd: ROOT, encoding: 'utf8', timeout: 300_000, env: env() });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

interface Worker {
  readonly child: ChildProcess;
  log: string;
}
function startWorker(config: string): Worker {
  const child = spawn(process.execPath, [CLI, 'worker', '--cluster', redis.url, '--config', config, '--lock-seconds', '3'], {
    cwd: ROOT,
    env: env(),
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  children.push(child);
  const w: Worker = { child, log: '' };
  child.stderr!.on('data', (b: Buffer) => {
    w.log += b.toString();
  });
  return w;
}

const waitFor = async (what: () => boolean, ms: number, label: string): Promise<void> => {
  const end = Date.now() + ms;
  while (!what()) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${label}`);
    await new Promise((r) => setTimeout(r, 50));
  }
};

/** Job ids of the worker's log lines with message `msg`. */
const jobLines = (log: string, msg: string): string[] =>
  log
    .split('\n')
    .filter((l) => l.includes(`"msg":"${msg}"`))
    .map((l) => /"job":"([0-9a-f]+)"/.exec(l)?.[1] ?? '');

/** A job the worker started and has not reported done. */
const unfinishedJob = (log: string): string | undefined => {
  const done = new Set(jobLines(log, 'job done'));
  return jobLines(log, 'job started').find((id) => !done.has(id));
};

/** Region stages with every probability behind them (run.json `regions`) of the newest run.json under an archive. */
function outcome(archive: string): unknown {
  const runs = readdirSync(archive, { recursive: true, encoding: 'utf8' })
    .filter((f) => f.endsWith('run.json'))
    .sort();
  expect(runs.length).toBeGreaterThan(0);
  const doc = JSON.parse(readFileSync(join(archive, runs[runs.length - 1]), 'utf8')) as { regions: unknown[] };
  expect(doc.regions.length).toBeGreaterThan(0);
  return doc.regions;
}

beforeAll(async () => {
  [redis, postgres, smtp] = await Promise.all([startRedis(), startPostgres(), startSmtp()]);
  sample = mkdtempSync(join(tmpdir(), 'forelight-cluster-sample-'));
  await generateSample(sample);
}, 240_000);

afterAll(async () => {
  for (const c of children) if (c.exitCode === null) c.kill('SIGKILL');
  await Promise.allSettled([redis?.stop(), smtp?.close()]);
  postgres?.stop();
});

describe('forelight run --cluster: 3 workers, PostgreSQL ledger, one worker killed mid-job', () => {
  it('completes with the single-process result and sends each recipient exactly one copy', async () => {
    // Reference: the same sample in one process on SQLite, into the outbox.
    const single = mkdtempSync(join(tmpdir(), 'forelight-single-'));
    const singleConfig = writeConfig(single, join(single, 'ledger.sqlite'), null);
    const reference = cli(['run', '--config', singleConfig, '--date', DATE]);
    expect(reference.code, reference.stderr).toBe(EXIT.ok);

    const dir = mkdtempSync(join(tmpdir(), 'forelight-cluster-'));
    postgres.createDatabase('cluster_ledger');
    const config = writeConfig(dir, postgres.url('cluster_ledger'), smtp.port);
    expect(cli(['ledger', 'migrate', '--config', config]).stdout).toMatch(/\(postgres\): schema version \d+, migrated from version 0/);

    const workers = [startWorker(config), startWorker(config), startWorker(config)];
    await waitFor(() => workers.every((w) => w.log.includes('worker ready')), 60_000, 'three workers');

    const run = spawn(process.execPath, [CLI, 'run', '--config', config, '--date', DATE, '--cluster', redis.url], {
      cwd: ROOT,
      env: env(),
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    children.push(run);
    let runOut = '';
    run.stdout!.on('data', (b: Buffer) => {
      runOut += b.toString();
    });
    run.stderr!.on('data', (b: Buffer) => {
      runOut += b.toString();
    });
    // Kill a worker while it holds a job: freeze it (SIGSTOP) as soon as it starts one, let its pipe drain, and
    // SIGKILL it only if the job is still unfinished (else let it go on and wait for the next job).
    let victim: Worker | undefined;
    let killedJob: string | undefined;
    while (!victim && run.exitCode === null) {
      const candidate = workers.find((w) => unfinishedJob(w.log) !== undefined);
      if (!candidate) {
        await new Promise((r) => setTimeout(r, 20));
        continue;
      }
      candidate.child.kill('SIGSTOP');
      await new Promise((r) => setTimeout(r, 300));
      const job = unfinishedJob(candidate.log);
      if (job) {
        candidate.child.kill('SIGKILL');
        victim = candidate;
        killedJob = job;
      } else candidate.child.kill('SIGCONT');
    }
    expect(victim, `no worker was caught holding a job; coordinator said: ${runOut}`).toBeDefined();
    const code = await new Promise<number | null>((r) => run.once('exit', r));
    expect(code, runOut).toBe(EXIT.ok);

    // The killed worker's job was done again by another worker.
    const survivors = workers.filter((w) => w !== victim);
    expect(
      survivors.some((w) => jobLines(w.log, 'job done').includes(killedJob!)),
      'stalled job recovered by another worker',
    ).toBe(true);
    expect(outcome(join(dir, 'archive'))).toEqual(outcome(join(single, 'archive')));

    // Exactly one copy per recipient, and the same recipients as the single-process outbox.
    const received = smtp.received.flatMap((m) => m.to).sort();
    expect(new Set(received).size).toBe(received.length);
    const outboxRecipients = readdirSync(join(single, 'outbox')).filter((f) => f.endsWith('.eml')).length;
    expect(received.length).toBe(outboxRecipients);

    // Idempotent: the same key again sends nothing, and status --cluster shows the two survivors.
    expect(cli(['run', '--config', config, '--date', DATE, '--cluster', redis.url]).code).toBe(EXIT.nothingNew);
    expect(smtp.received.flatMap((m) => m.to).length).toBe(received.length);
    const status = cli(['status', '--config', config, '--cluster', redis.url]);
    expect(status.stdout).toMatch(/cluster redis:\/\/127\.0\.0\.1:\d+: 2 worker\(s\); jobs waiting 0, active 0/);
  }, 600_000);
});
