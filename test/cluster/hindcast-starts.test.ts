/**
 * First-time climate build distributed per hindcast start and per region, on real parts (Debian's redis-server on
 * loopback, two `forelight worker` processes, the Veloria sample's NetCDF files). Each start of each source is one
 * job whose answer is its lead values, then each region of each source one job that stacks, verifies and tunes
 * them; the model climates the coordinator stores from them must be byte for byte the skill-cache
 * entries a single process writes (the reference is that single-process build; no outside source: the claim is
 * identity). Asking again with an empty cache is answered from Redis without any worker reading a file.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { connectCluster } from '../../src/cluster/coordinator.ts';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import { analyse } from '../../src/pipeline/analyse.ts';
import { resolveInputs } from '../../src/pipeline/inputs.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { startRedis, type TestRedis } from '../support/servers.ts';

const CLI = fileURLToPath(new URL('../../bin/forelight.mjs', import.meta.url));
const issueDate = '2026-11-26';

let redis: TestRedis;
let sampleDir: string;
let base: Config;
const workers: { child: ChildProcess; log: string }[] = [];

/** The sample's configuration with its own cache folder (so each build starts without climates). */
const withCache = (name: string): Config => ({ ...base, calibration: { ...base.calibration, cacheDir: join(sampleDir, name) } });

/** Contents of the skill-cache entries of a cache folder, sorted (keys differ: the folder is part of the fingerprint). */
const entries = (config: Config): string[] =>
  readdirSync(config.calibration.cacheDir)
    .filter((f) => f.startsWith('skill-'))
    .map((f) => readFileSync(join(config.calibration.cacheDir, f), 'utf8'))
    .sort();

/** Worker log lines of jobs of `kind` with message `msg`. */
const jobsOf =
  (kind: string) =>
  (log: string, msg: string): string[] =>
    log.split('\n').filter((l) => l.includes(`"msg":"${msg}"`) && l.includes(`"kind":"${kind}"`));
const startJobs = jobsOf('reduce-start');
const regionJobs = jobsOf('calibrate-region');

/** A start job the worker started and has not reported done. */
function unfinished(log: string): string | undefined {
  const id = (l: string) => /"job":"([0-9a-f]+)"/.exec(l)?.[1] ?? '';
  const done = new Set(startJobs(log, 'job done').map(id));
  return startJobs(log, 'job started')
    .map(id)
    .find((j) => !done.has(j));
}

beforeAll(async () => {
  redis = await startRedis();
  sampleDir = mkdtempSync(join(tmpdir(), 'forelight-starts-'));
  await generateSample(sampleDir);
  const shipped = await loadConfig();
  const move = (p: string) => p.replace(/.*sample-inputs\/data/, sampleDir);
  base = {
    ...shipped,
    sources: shipped.sources.map((s) => ({ ...s, forecast: s.forecast.map(move), hindcast: s.hindcast && move(s.hindcast) })),
    observations: shipped.observations && { ...shipped.observations, path: move(shipped.observations.path) },
  };
  for (let i = 0; i < 2; i++) {
    const child = spawn(process.execPath, [CLI, 'worker', '--cluster', redis.url, '--lock-seconds', '5'], {
      env: { ...process.env, FORELIGHT_LOG_LEVEL: 'info' },
      stdio: ['ignore', 'ignore', 'pipe'],
    });
    const w = { child, log: '' };
    child.stderr!.on('data', (b: Buffer) => (w.log += b.toString()));
    workers.push(w);
  }
  const end = Date.now() + 60_000;
  while (!workers.every((w) => w.log.includes('worker ready'))) {
    if (Date.now() > end) throw new Error(`workers did not start: ${workers.map((w) => w.log).join('\n')}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}, 240_000);

afterAll(async () => {
  for (const w of workers) if (w.child.exitCode === null) w.child.kill('SIGKILL');
  await redis?.stop();
});

describe('first-time climate build with one job per hindcast start and per region (2 workers, loopback Redis)', () => {
  it('builds byte-identical model climates to a single process, one job per start and per region, answered again from Redis', async () => {
    const single = withCache('single');
    const local = await analyse(single, runContext({ issueDate, log: silentLogger }));

    const distributed = withCache('cluster');
    const starts = (await resolveInputs(distributed, issueDate)).reduce((n, i) => n + i.hindcasts.length, 0);
    expect(starts).toBeGreaterThan(2);
    const cluster = await connectCluster(redis.url, { log: silentLogger, cacheDir: distributed.calibration.cacheDir });
    try {
      const remote = await analyse(distributed, runContext({ issueDate, log: silentLogger }), cluster.readers);
      expect(entries(distributed)).toEqual(entries(single));
      expect(entries(single).length).toBe(local.sources.filter((s) => s.climates.size > 0).length);
      expect(remote.probabilities).toEqual(local.probabilities);
      expect(remote.problems).toEqual(local.problems);

      const done = workers.map((w) => startJobs(w.log, 'job done').length);
      expect(
        done.reduce((a, b) => a + b, 0),
        'one job per hindcast start',
      ).toBe(starts);
      expect(
        done.every((n) => n > 0),
        `both workers reduced starts (${done.join(' + ')})`,
      ).toBe(true);
      // Then one job per region of each source with hindcasts: stacked, verified and tuned by a worker.
      // (the workers' log lines arrive through pipes: wait for the last ones)
      const calibrated = () => workers.reduce((n, w) => n + regionJobs(w.log, 'job done').length, 0);
      const expected = base.regions.length * entries(single).length;
      for (const end = Date.now() + 10_000; calibrated() < expected && Date.now() < end;) await new Promise((r) => setTimeout(r, 50));
      expect(calibrated(), 'one job per region and source').toBe(expected);
      // Hindcasts are reduced inside start jobs; the only extraction of one is each source's first start, which the
      // read stage compares with the forecast's grid (pipeline/usable-forecast.ts).
      const extracted = workers.flatMap((w) =>
        w.log.split('\n').filter((l) => l.includes('"kind":"extract"') && l.includes('job started')),
      );
      const firstStarts = (await resolveInputs(distributed, issueDate)).flatMap((i) => i.hindcasts.slice(0, 1).map((h) => h.path));
      const hindcastsExtracted = extracted.flatMap((l) => /"path":"([^"]*\/hindcast\/[^"]*)"/.exec(l)?.[1] ?? []);
      expect([...new Set(hindcastsExtracted)].sort()).toEqual(firstStarts.sort());

      // Same request, empty cache: every start is answered from Redis, no worker starts a start job.
      const again = withCache('again');
      const started = () => workers.map((w) => startJobs(w.log, 'job started').length + regionJobs(w.log, 'job started').length);
      const before = started();
      await analyse(again, runContext({ issueDate, log: silentLogger }), cluster.readers);
      expect(entries(again)).toEqual(entries(single));
      expect(started()).toEqual(before);
    } finally {
      await cluster.close();
    }
  }, 600_000);

  it('a worker sent SIGTERM mid-job finishes that job, then leaves with exit 0; the build completes as in one process', async () => {
    // Another region list is another request: new jobs, none answered from Redis.
    const regions = base.regions.slice(1);
    const single = { ...withCache('term-single'), regions };
    await analyse(single, runContext({ issueDate, log: silentLogger }));
    const distributed = { ...withCache('term-cluster'), regions };
    const cluster = await connectCluster(redis.url, { log: silentLogger, cacheDir: distributed.calibration.cacheDir });
    try {
      const build = analyse(distributed, runContext({ issueDate, log: silentLogger }), cluster.readers);
      let stopped: { w: (typeof workers)[number]; job: string } | undefined;
      let finished = false;
      void build.finally(() => (finished = true));
      // Freeze a worker as soon as it holds a start job, let its log drain, then SIGTERM it (delivered on SIGCONT).
      while (!stopped && !finished) {
        const w = workers.find((x) => x.child.exitCode === null && unfinished(x.log) !== undefined);
        if (!w) {
          await new Promise((r) => setTimeout(r, 10));
          continue;
        }
        w.child.kill('SIGSTOP');
        await new Promise((r) => setTimeout(r, 300));
        const job = unfinished(w.log);
        if (job) {
          w.child.kill('SIGTERM');
          stopped = { w, job };
        }
        w.child.kill('SIGCONT');
      }
      expect(stopped, 'a worker was caught holding a start job').toBeDefined();
      const code = await new Promise<number | null>((r) =>
        stopped!.w.child.exitCode !== null ? r(stopped!.w.child.exitCode) : stopped!.w.child.once('exit', r),
      );
      expect(code).toBe(0);
      const lines = stopped!.w.log.split('\n');
      const stopping = lines.findIndex((l) => l.includes('worker stopping'));
      const doneAt = lines.findIndex((l) => l.includes('"msg":"job done"') && l.includes(stopped!.job));
      expect(stopping, 'the worker said it was stopping').toBeGreaterThanOrEqual(0);
      expect(doneAt, 'and finished the job in hand after that').toBeGreaterThan(stopping);
      await build;
      expect(entries(distributed)).toEqual(entries(single));
    } finally {
      await cluster.close();
    }
  }, 600_000);
});
