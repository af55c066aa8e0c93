/**
 * The fault matrix (issue: no fault may give a bulletin calmer than the last good advice without saying why).
 * The Veloria sample is issued on 23 and 26 Nov 2026 (history in a real SQLite ledger), then 30 Nov is issued once
 * clean and once per fault, each from a copy of that history:
 * - the newest file of each tier damaged with real tools (NCO ncrename/ncatted/ncks, nccopy, netCDF4-python):
 *   truncated classic, truncated NetCDF-4, renamed variable, no units, all values missing, another grid;
 * - an empty file and a folder at the newest short-range path; a region without grid cells;
 * - a refused SMTP login (535) from a real smtp-server on 127.0.0.1;
 * - the archive folder on a real tmpfs remounted read-only (EROFS), and on a real tmpfs filled up (ENOSPC): the
 *   e-mails still go out, exit 4, the message and the operator notice name the folder and the fix, no temp file is
 *   left (single writes: test/core/write-atomic.test.ts).
 * - the SQLite ledger on a real tmpfs filled up: the run stops before sending with one line naming the ledger and the
 *   fix, no temp file left; once space is freed the next run sends every bulletin exactly once.
 * For each: the exit code; no region below its previous stage or below the clean run purely because data vanished;
 * the bulletin names the missing part (or the older forecast used); an operator notice; every team still gets its
 * bulletin, each Message-ID once; no bulletin contradicts itself (render/consistency.ts in every render, and the rows
 * of the text as sent).
 */
import { execFileSync } from 'node:child_process';
import {
  copyFileSync,
  cpSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  rmSync,
  statSync,
  symlinkSync,
  truncateSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, dirname, join } from 'node:path';
import { simpleParser } from 'mailparser';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { EXIT } from '../../src/core/exit-codes.ts';
import { ForelightError, describeError } from '../../src/core/errors.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import { NO_FORECAST_ID, stageRank } from '../../src/decide/types.ts';
import { openLedger } from '../../src/ledger/open-ledger.ts';
import { lastIssuedStages } from '../../src/ledger/results.ts';
import { runOnce, type RunOutcome } from '../../src/pipeline/run-once.ts';
import { issuedRegionStages } from '../../src/pipeline/bulletin-run.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { startSmtp, type SmtpFixture } from '../deliver/fixtures.ts';
import { fill, mountFaults, mountTmpfs, type Mounted } from '../support/small-disk.ts';
import { runDiagnostics } from '../../src/ledger/diagnostics.ts';
import { rowsAboveStageWithoutReason } from '../support/bulletin-rows.ts';

const HISTORY = ['2026-11-23', '2026-11-26'];
const ISSUE = '2026-11-30';
const NEWEST = {
  short: 'short/short_20261130.nc',
  subseasonal: 'subseasonal/subs_20261130.nc',
  seasonal: 'seasonal/seas_20261126.nc',
} as const;
const TIER_WORDS = { short: 'short-range', subseasonal: 'sub-seasonal', seasonal: 'seasonal' } as const;
type SourceId = keyof typeof NEWEST;

let sampleDir: string;
let base: Config;
let historyDir: string;

const tmp = (p: string) => mkdtempSync(join(tmpdir(), `forelight-fault-${p}-`));

/** Shipped config, hindcasts and observations from the sample, forecasts from `forecastDir`, outputs under `dir`. */
function configFor(dir: string, forecastDir: string, cacheDir: string): Config {
  const sample = (p: string) => p.replace(/.*sample-inputs\/data/, sampleDir);
  return {
    ...base,
    sources: base.sources.map((s) => ({
      ...s,
      forecast: s.forecast.map((p) => p.replace(/.*sample-inputs\/data/, forecastDir)),
      hindcast: s.hindcast && sample(s.hindcast),
    })),
    observations: base.observations && { ...base.observations, path: sample(base.observations.path) },
    ledger: join(dir, 'ledger.sqlite'),
    delivery: { ...base.delivery, outbox: join(dir, 'outbox'), archive: join(dir, 'archive') },
    calibration: { ...base.calibration, cacheDir },
  };
}

/** Forecast files of the sample, linked (not copied) into a fresh folder, so one of them can be replaced. */
function forecastCopy(): string {
  const dir = tmp('fc');
  for (const sub of ['short', 'subseasonal', 'seasonal']) {
    mkdirSync(join(dir, sub));
    for (const f of readdirSync(join(sampleDir, sub))) if (f.endsWith('.nc')) symlinkSync(join(sampleDir, sub, f), join(dir, sub, f));
  }
  return dir;
}

/** Replace `rel` in a forecast copy by what `make(src, dst)` writes from the original. */
function damage(dir: string, rel: string, make: (src: string, dst: string) => void): void {
  rmSync(join(dir, rel));
  make(join(sampleDir, rel), join(dir, rel));
}

const run = (cmd: string, ...args: string[]) => execFileSync(cmd, args, { stdio: 'pipe' });
const py = (code: string, ...args: string[]) => run('/usr/bin/python3', '-c', code, ...args);
const firstVar = (_src: string) => 'tasmax';

const DAMAGES: Record<string, (src: string, dst: string) => void> = {
  'truncated classic file': (src, dst) => {
    copyFileSync(src, dst);
    truncateSync(dst, Math.floor(statSync(src).size * 0.6));
  },
  'truncated NetCDF-4 file (nccopy -k nc4)': (src, dst) => {
    run('nccopy', '-k', 'nc4', '-d', '1', src, dst);
    truncateSync(dst, Math.floor(statSync(dst).size * 0.5));
  },
  'renamed variable (ncrename)': (src, dst) => run('ncrename', '-O', '-v', `${firstVar(src)},tmax_renamed`, src, dst),
  'no units (ncatted -a units,d)': (src, dst) => run('ncatted', '-O', '-a', `units,${firstVar(src)},d,,`, src, dst),
  'all values missing (netCDF4-python writes _FillValue everywhere)': (src, dst) => {
    copyFileSync(src, dst);
    py(
      'import sys, netCDF4\nd = netCDF4.Dataset(sys.argv[1], "a")\nv = d.variables["tasmax"]\nv.set_auto_maskandscale(False)\nv[:] = v._FillValue\nd.close()',
      dst,
    );
  },
  'another grid (ncks keeps every second latitude and longitude)': (src, dst) =>
    run('ncks', '-O', '-d', 'lat,,,2', '-d', 'lon,,,2', src, dst),
};

interface Scenario {
  readonly outcome: RunOutcome;
  readonly config: Config;
  /** Region → stage id of this run, and of the run before it (26 Nov). */
  readonly stages: Map<string, string>;
  readonly before: Map<string, string>;
  readonly texts: string[];
  readonly notices: string[];
  readonly messageIds: string[];
  /** Findings of the consistency checker that ran inside the render (ledger run_diagnostics). */
  readonly contradictions: string[];
}

async function issue(
  name: string,
  options: { forecastDir?: string; edit?: (c: Config, dir: string) => Config; smtp?: SmtpFixture; env?: NodeJS.ProcessEnv } = {},
): Promise<Scenario> {
  const dir = tmp(name.replace(/\W+/g, '-').slice(0, 30));
  copyFileSync(join(historyDir, 'ledger.sqlite'), join(dir, 'ledger.sqlite'));
  cpSync(join(historyDir, 'archive'), join(dir, 'archive'), { recursive: true });
  let config = configFor(dir, options.forecastDir ?? forecastCopy(), join(historyDir, 'cache'));
  if (options.edit) config = options.edit(config, dir);
  const ledgerBefore = openLedger(config.ledger);
  const before = new Map(issuedRegionStages(config, lastIssuedStages(ledgerBefore)).map((r) => [r.region, r.stageId]));
  ledgerBefore.close();
  const outcome = await runOnce({
    config,
    run: runContext({ log: silentLogger, issueDate: ISSUE, now: () => new Date(`${ISSUE}T07:30:00Z`) }),
    mode: 'exercise',
    deliver: { sleep: async () => {}, env: options.env },
  });
  const ledger = openLedger(config.ledger);
  const stages = new Map(issuedRegionStages(config, lastIssuedStages(ledger)).map((r) => [r.region, r.stageId]));
  const found = outcome.runId === null ? [] : runDiagnostics(ledger, outcome.runId).filter((d) => d.code === 'bulletin-contradiction');
  ledger.close();
  const outbox = config.delivery.outbox;
  const files = existsSync(outbox) ? readdirSync(outbox) : [];
  const parsed = await Promise.all(
    files.filter((f) => f.endsWith('.eml') && !f.startsWith('notice_')).map(async (f) => simpleParser(readFileSync(join(outbox, f)))),
  );
  const smtpParsed = await Promise.all((options.smtp?.received ?? []).map((r) => simpleParser(r.raw)));
  const all = [...parsed, ...smtpParsed];
  return {
    outcome,
    config,
    stages,
    before,
    texts: all.map((m) => m.text ?? ''),
    notices: files.filter((f) => f.startsWith('notice_')).map((f) => readFileSync(join(outbox, f), 'utf8')),
    messageIds: all.map((m) => m.messageId ?? ''),
    contradictions: found.map((d) => d.message),
  };
}

let clean: Scenario;

beforeAll(async () => {
  sampleDir = tmp('sample');
  await generateSample(sampleDir);
  base = await loadConfig();
  historyDir = tmp('history');
  const config = configFor(historyDir, sampleDir, join(historyDir, 'cache'));
  for (const d of HISTORY)
    await runOnce({
      config,
      run: runContext({ log: silentLogger, issueDate: d, now: () => new Date(`${d}T07:30:00Z`) }),
      mode: 'exercise',
    });
  clean = await issue('clean');
}, 600_000);

const recipients = () => base.teams.reduce((n, t) => n + t.recipients.length, 0);
const rank = (id: string | undefined) => (id === undefined || id === NO_FORECAST_ID ? -1 : stageRank(base.stages, id));

/** What every fault must keep: no region calmer than before or than the clean run without a word; everyone served once. */
function expectSafe(s: Scenario): void {
  for (const region of base.regions) {
    const now = rank(s.stages.get(region.id));
    const floor = Math.min(rank(s.before.get(region.id)), rank(clean.stages.get(region.id)));
    expect(
      now,
      `${region.id}: ${s.stages.get(region.id)} after ${s.before.get(region.id)} (clean run: ${clean.stages.get(region.id)})`,
    ).toBeGreaterThanOrEqual(floor);
  }
  expect(s.messageIds).toHaveLength(recipients());
  expect(new Set(s.messageIds).size).toBe(recipients());
  // No bulletin contradicts itself: the checker of every render found nothing, and no row of the text as sent
  // points above its range's stage without saying why.
  expect(s.contradictions).toEqual([]);
  for (const text of s.texts)
    expect(
      rowsAboveStageWithoutReason(
        text,
        base.stages.map((st) => st.glyph),
      ),
    ).toEqual([]);
}

describe('clean run of 30 Nov (the reference)', () => {
  it('issues every region with exit 0 and a consistent bulletin', () => {
    expect(clean.outcome.exitCode).toBe(EXIT.ok);
    expectSafe(clean);
  });
});

describe.each(Object.keys(NEWEST) as SourceId[])('damaged newest %s forecast', (source) => {
  it.each(Object.keys(DAMAGES))(
    '%s: input problem named (exit 3), older forecast or held stage said, nothing calmer, notice written',
    async (kind) => {
      const forecastDir = forecastCopy();
      damage(forecastDir, NEWEST[source], DAMAGES[kind]);
      const s = await issue(`${source}-${kind}`, { forecastDir });
      expect(s.outcome.exitCode).toBe(EXIT.inputProblem);
      expect((s.outcome.problems ?? []).some((p) => p.includes(basename(NEWEST[source])))).toBe(true);
      expect(s.outcome.summary).toMatch(/[1-9]\d* input problem\(s\)/);
      expectSafe(s);
      const en = s.texts.filter((t) => /READ BEFORE ACTING/i.test(t));
      expect(en.length).toBeGreaterThan(0);
      for (const text of en) {
        // Either an older forecast of the source was used (and said), or the missing part is named.
        expect(text).toMatch(new RegExp(`based on the forecast of|No ${TIER_WORDS[source]} forecast could be used this time`));
      }
      expect(s.notices.some((n) => n.includes(basename(NEWEST[source])))).toBe(true);
    },
    240_000,
  );
});

describe('files that are not forecasts at the newest short-range path', () => {
  it.each([
    ['an empty file', (p: string) => writeFileSync(p, '')],
    ['a folder', (p: string) => mkdirSync(p)],
  ])(
    '%s is an input problem (exit 3) and the previous forecast is used and said',
    async (_name, make) => {
      const forecastDir = forecastCopy();
      rmSync(join(forecastDir, NEWEST.short));
      make(join(forecastDir, NEWEST.short));
      const s = await issue(`short-${_name}`, { forecastDir });
      expect(s.outcome.exitCode).toBe(EXIT.inputProblem);
      expect((s.outcome.problems ?? []).some((p) => p.includes('short_20261130.nc'))).toBe(true);
      expect(s.outcome.summary).toMatch(/short 2026-11-26/);
      expectSafe(s);
      expect(
        s.texts.some((t) =>
          /Short-range forecast: the newer forecast was late, so this bulletin is based on the forecast of 26 Nov 2026/.test(t),
        ),
      ).toBe(true);
      expect(s.notices.some((n) => n.includes('short_20261130.nc'))).toBe(true);
    },
    240_000,
  );
});

describe('a region without grid cells', () => {
  it('is "no forecast available" (its own glyph, never Quiet), the others are as in the clean run', async () => {
    const s = await issue('no-cells', {
      edit: (c) => ({
        ...c,
        regions: [
          ...c.regions,
          {
            id: 'far-isle',
            name: 'Far Isle',
            shape: { kind: 'box', south: 60, north: 61, west: 100, east: 101 },
            utcOffsetHours: 1,
            teams: [c.teams.find((t) => t.national)?.id ?? c.teams[0].id],
          },
        ],
      }),
    });
    expect(s.outcome.exitCode, s.outcome.summary).toBe(EXIT.inputProblem);
    expect(s.stages.get('far-isle')).toBe(NO_FORECAST_ID);
    for (const region of base.regions) expect(s.stages.get(region.id)).toBe(clean.stages.get(region.id));
    expect(s.texts.some((t) => /FAR ISLE: ⊘ No forecast available/.test(t))).toBe(true);
    expect(s.texts.some((t) => /Far Isle: Quiet/.test(t))).toBe(false);
  }, 240_000);
});

describe('SMTP login refused (535) by a real server on 127.0.0.1', () => {
  it('every copy goes to the outbox, the notice too, exit 4; nothing sent, nothing lost', async () => {
    const smtp = await startSmtp({}, { auth: { user: 'forelight', pass: 'right' } });
    try {
      const s = await issue('smtp-535', {
        smtp,
        env: { FORELIGHT_SMTP_PASSWORD: 'wrong' },
        edit: (c) => ({
          ...c,
          delivery: {
            ...c.delivery,
            retries: 0,
            smtp: {
              host: '127.0.0.1',
              port: smtp.port,
              security: 'none',
              timeoutSeconds: 5,
              user: 'forelight',
              passwordEnv: 'FORELIGHT_SMTP_PASSWORD',
            },
          },
        }),
      });
      expect(s.outcome.exitCode).toBe(EXIT.deliveryFailed);
      expect(smtp.received).toHaveLength(0);
      expectSafe(s);
      expect(s.notices.some((n) => /refused the login/.test(n))).toBe(true);
    } finally {
      await smtp.close();
    }
  }, 240_000);
});

/** Every temporary file (write-atomic's ".tmp-" mark) under the given folders. */
function tempFiles(...dirs: string[]): string[] {
  return dirs.flatMap((d) =>
    existsSync(d)
      ? (readdirSync(d, { recursive: true }) as string[]).filter((f) => basename(f).includes('.tmp-')).map((f) => join(d, f))
      : [],
  );
}

describe.skipIf(!mountFaults())('the archive folder on a faulty disk (real tmpfs, mount(8))', () => {
  const cases: [string, (disk: Mounted) => void, RegExp][] = [
    ['read-only (EROFS)', (disk) => disk.readOnly(), /EROFS.*read-only file system: remount it read-write/],
    ['full (ENOSPC)', (disk) => fill(disk.dir), /ENOSPC.*is full: free space there/],
  ];
  it.each(cases)(
    '%s: every e-mail still goes out, exit 4, path and fix named on the terminal and in the notice, no temp file left',
    async (_name, fault, fix) => {
      const disk = mountTmpfs(64 * 1024);
      try {
        cpSync(join(historyDir, 'archive'), disk.dir, { recursive: true });
        fault(disk);
        const s = await issue(`archive-${_name}`, { edit: (c) => ({ ...c, delivery: { ...c.delivery, archive: disk.dir } }) });
        expect(s.outcome.exitCode, s.outcome.summary).toBe(EXIT.deliveryFailed);
        expect(s.outcome.summary).toMatch(new RegExp(`output problem\\(s\\): archive: .*${disk.dir}`));
        expect(s.outcome.summary).toMatch(fix);
        expectSafe(s);
        expect(s.notices.some((n) => n.includes('outputs not written') && n.includes(disk.dir))).toBe(true);
        expect(tempFiles(disk.dir, s.config.delivery.outbox, dirname(s.config.ledger))).toEqual([]);
        // The stages were issued and stored although the archive could not be written.
        expect(s.stages).toEqual(clean.stages);
      } finally {
        disk.unmount();
      }
    },
    240_000,
  );
});

describe.skipIf(!mountFaults())('the ledger on a full disk (real tmpfs, mount(8), holding the SQLite file)', () => {
  it('stops before sending with one line naming the ledger and the fix (exit 1), no temp file left; once space is freed the next run sends every bulletin exactly once', async () => {
    const dir = tmp('ledger-full');
    const size = statSync(join(historyDir, 'ledger.sqlite')).size;
    const disk = mountTmpfs(Math.ceil(size / 1024) + 64 * 1024);
    try {
      const config = { ...configFor(dir, forecastCopy(), join(historyDir, 'cache')), ledger: join(disk.dir, 'ledger.sqlite') };
      copyFileSync(join(historyDir, 'ledger.sqlite'), config.ledger);
      cpSync(join(historyDir, 'archive'), config.delivery.archive, { recursive: true });
      fill(disk.dir);
      const go = () =>
        runOnce({
          config,
          run: runContext({ log: silentLogger, issueDate: ISSUE, now: () => new Date(`${ISSUE}T07:30:00Z`) }),
          mode: 'exercise',
          deliver: { sleep: async () => {} },
        });
      const failed = await go().then(
        () => null,
        (err: unknown) => err,
      );
      expect(failed).toBeInstanceOf(ForelightError);
      const line = describeError(failed);
      expect(line).toContain(config.ledger);
      expect(line).toMatch(new RegExp(`SQLITE_(FULL|IOERR_SHMSIZE).*the disk holding ${disk.dir} is full: free space there`));
      // src/cli/main.ts: a ForelightError of the ledger stage exits 1 (README, exit codes).
      expect([(failed as ForelightError).stage, (failed as ForelightError).code]).toEqual(['ledger', 'ledger-write']);
      const sentBefore = existsSync(config.delivery.outbox)
        ? readdirSync(config.delivery.outbox).filter((f) => f.endsWith('.eml') && !f.startsWith('notice_'))
        : [];
      expect(sentBefore).toEqual([]);
      expect(tempFiles(disk.dir, config.delivery.outbox)).toEqual([]);
      expect(readdirSync(disk.dir).filter((f) => f !== 'filler' && statSync(join(disk.dir, f)).size === 0 && !f.endsWith('-wal'))).toEqual(
        [],
      );

      rmSync(join(disk.dir, 'filler'));
      const again = await go();
      expect(again.exitCode, again.summary).toBe(clean.outcome.exitCode);
      const outbox = readdirSync(config.delivery.outbox).filter((f) => f.endsWith('.eml') && !f.startsWith('notice_'));
      const ids = await Promise.all(outbox.map(async (f) => (await simpleParser(readFileSync(join(config.delivery.outbox, f)))).messageId));
      expect(ids).toHaveLength(recipients());
      expect(new Set(ids).size).toBe(recipients());
      const ledger = openLedger(config.ledger);
      const stages = new Map(issuedRegionStages(config, lastIssuedStages(ledger)).map((r) => [r.region, r.stageId]));
      ledger.close();
      expect(stages).toEqual(clean.stages);
      expect(tempFiles(disk.dir, config.delivery.outbox)).toEqual([]);
    } finally {
      disk.unmount();
    }
  }, 480_000);
});
