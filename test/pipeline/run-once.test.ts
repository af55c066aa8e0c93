/**
 * The main job end to end on the invented Veloria sample (real NetCDF files, real SQLite ledger, outbox
 * delivery): three issues in order, every CAP alert checked with xmllint against the OASIS CAP 1.2 schema,
 * no duplicate on a re-run, and one bad source never stopping the others.
 */
import { execFileSync } from 'node:child_process';
import { copyFileSync, cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, truncateSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import Database from 'better-sqlite3';
import { simpleParser } from 'mailparser';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { formatDiagnostic, isDiagnostic, type Diagnostic } from '../../src/core/diagnostics.ts';
import { ForelightError } from '../../src/core/errors.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import { runOnce } from '../../src/pipeline/run-once.ts';
import { EXIT } from '../../src/core/exit-codes.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { onSample, outputsIn } from '../support/sample-run-config.ts';

const SCHEMA = fileURLToPath(new URL('../reference/CAP-v1.2.xsd', import.meta.url));
const ISSUES = ['2026-11-23', '2026-11-26', '2026-11-30'];

function filesUnder(dir: string, ext: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir, { recursive: true, encoding: 'utf8' })
    .filter((f) => f.endsWith(ext))
    .map((f) => join(dir, f));
}

let sampleDir: string;
let base: Config;

beforeAll(async () => {
  sampleDir = mkdtempSync(join(tmpdir(), 'forelight-sample-'));
  await generateSample(sampleDir);
  base = await loadConfig();
}, 120_000);

describe('forelight run on the Veloria sample (three issues in order)', () => {
  let config: Config;
  const outcomes: Awaited<ReturnType<typeof runOnce>>[] = [];

  beforeAll(async () => {
    config = outputsIn(onSample(base, sampleDir), mkdtempSync(join(tmpdir(), 'forelight-run-')));
    for (const issueDate of ISSUES) {
      outcomes.push(
        await runOnce({
          config,
          run: runContext({ log: silentLogger, issueDate, now: () => new Date(`${issueDate}T07:30:00Z`) }),
          mode: 'exercise',
        }),
      );
    }
  }, 240_000);

  it('issues each date; the first lacks the monthly seasonal forecast and says so (exit 3), the others are clean (exit 0)', () => {
    expect(outcomes.map((o) => o.exitCode)).toEqual([EXIT.inputProblem, EXIT.ok, EXIT.ok]);
    expect(outcomes[0].summary).toMatch(/seasonal none/);
  });

  it("writes one .eml per bulletin and recipient to the outbox, each Message-ID once (no duplicates); the first issue's input problem goes to the operators", async () => {
    const all = filesUnder(config.delivery.outbox, '.eml');
    const notices = all.filter((f) => f.includes('notice_'));
    expect(notices).toHaveLength(1);
    expect(readFileSync(notices[0], 'utf8')).toMatch(/input problems in the run of 2026-11-23/);
    const emls = all.filter((f) => !f.includes('notice_'));
    const recipients = config.teams.reduce((n, t) => n + t.recipients.length, 0);
    expect(emls.length).toBe(ISSUES.length * recipients);
    const parsed = await Promise.all(emls.map((f) => simpleParser(readFileSync(f))));
    const ids = parsed.map((m) => m.messageId);
    expect(ids.every((id) => typeof id === 'string' && id.length > 10)).toBe(true);
    expect(new Set(ids).size).toBe(emls.length);
    for (const m of parsed) {
      expect(m.text).toMatch(/probabilistic|probabilistes/); // the caution, in English or French
      expect(m.html).toBeTruthy();
    }
  });

  it('keeps the audit trail: inputs with sha256, probabilities, decisions and one delivery row per recipient', () => {
    const db = new Database(config.ledger, { readonly: true });
    try {
      const runs = db.prepare('SELECT id, status FROM runs ORDER BY id').all() as { id: number; status: string }[];
      expect(runs.map((r) => r.status)).toEqual(['partial', 'ok', 'ok']);
      const inputs = db.prepare('SELECT sha256 FROM input_files WHERE run_id = ?').all(runs[1].id) as { sha256: string }[];
      expect(inputs.length).toBeGreaterThan(20);
      for (const i of inputs) expect(i.sha256).toMatch(/^[0-9a-f]{64}$/);
      expect((db.prepare('SELECT count(*) AS n FROM probabilities WHERE run_id = ?').get(runs[2].id) as { n: number }).n).toBeGreaterThan(
        100,
      );
      const statuses = db.prepare('SELECT status, count(*) AS n FROM deliveries GROUP BY status').all() as { status: string; n: number }[];
      expect(statuses).toEqual([
        { status: 'outbox', n: filesUnder(config.delivery.outbox, '.eml').filter((f) => !f.includes('notice_')).length },
      ]);
    } finally {
      db.close();
    }
  });

  it('every CAP alert of the run validates against the OASIS CAP 1.2 schema (xmllint, Debian libxml2-utils)', () => {
    const alerts = filesUnder(config.delivery.archive, '.xml');
    expect(alerts.length).toBeGreaterThan(0);
    const out = execFileSync('xmllint', ['--noout', '--schema', SCHEMA, ...alerts], {
      encoding: 'utf8',
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    expect(out).toBe('');
  });

  it('run.json carries the full numbers for downstream systems', () => {
    const runJson = filesUnder(config.delivery.archive, 'run.json').sort().at(-1) as string;
    const parsed = JSON.parse(readFileSync(runJson, 'utf8')) as { schema: string; regions: unknown[]; notes: string[] };
    expect(parsed.schema).toBe('forelight-run/2');
    expect(parsed.regions).toHaveLength(config.regions.length);
    expect(Array.isArray(parsed.notes)).toBe(true);
  });

  it('re-running the newest issue sends nothing new (nothing-new, exit 5) and tells the operators', async () => {
    const before = filesUnder(config.delivery.outbox, '.eml').length;
    const again = await runOnce({ config, run: runContext({ log: silentLogger, issueDate: '2026-11-30' }), mode: 'exercise' });
    expect(again.exitCode).toBe(EXIT.nothingNew);
    const after = filesUnder(config.delivery.outbox, '.eml');
    expect(after.length).toBe(before + 1);
    expect(after.filter((f) => f.includes('notice_') && readFileSync(f, 'utf8').includes('nothing new for 2026-11-30'))).toHaveLength(1);
  });
});

describe('one bad source never stops the others', () => {
  it('a truncated short-range forecast is reported by file name and counts as late: the previous one (23 Nov) is used and said (exit 3)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-bad-'));
    const copy = join(dir, 'data');
    cpSync(sampleDir, copy, { recursive: true });
    const bad = join(copy, 'short', 'short_20261126.nc');
    truncateSync(bad, 5000);
    const config = outputsIn(onSample(base, copy), dir);
    const outcome = await runOnce({ config, run: runContext({ log: silentLogger, issueDate: '2026-11-26' }), mode: 'exercise' });
    expect(outcome.exitCode).toBe(EXIT.inputProblem);
    const db = new Database(config.ledger, { readonly: true });
    try {
      const run = db.prepare('SELECT status FROM runs').get() as { status: string };
      expect(run.status).toBe('partial');
      const problems = db.prepare('SELECT code, severity, diagnostic_json FROM run_diagnostics ORDER BY position').all() as {
        code: string;
        severity: string;
        diagnostic_json: string;
      }[];
      const truncated = problems.filter((p) => p.code === 'input-truncated').map((p) => JSON.parse(p.diagnostic_json) as Diagnostic);
      expect(truncated).toHaveLength(1);
      expect(truncated[0].place.file).toBe(bad);
      expect(truncated[0].severity).toBe('error');
      expect(formatDiagnostic(truncated[0])).toMatch(/^.*short_20261126\.nc: file is truncated/);
      const tiers = db.prepare('SELECT DISTINCT tier FROM probabilities ORDER BY tier').all() as { tier: string }[];
      expect(tiers.map((t) => t.tier)).toEqual(['days', 'months', 'weeks']);
      expect((db.prepare('SELECT forecast_key AS k FROM runs').get() as { k: string }).k).toMatch(/^short 2026-11-23, /);
      expect(problems.some((p) => p.code === 'forecast-fallback')).toBe(true);
    } finally {
      db.close();
    }
    expect(filesUnder(config.delivery.outbox, '.eml').length).toBeGreaterThan(0);
    const runJson = JSON.parse(readFileSync(filesUnder(config.delivery.archive, 'run.json')[0], 'utf8')) as {
      problems: unknown[];
      notes: string[];
    };
    expect(runJson.problems.every(isDiagnostic)).toBe(true);
    expect(
      runJson.problems.filter((p) => isDiagnostic(p) && p.code === 'input-truncated').map((p) => (p as Diagnostic).place.file),
    ).toEqual([bad]);
    expect(runJson.notes.some((n) => n.includes('truncated'))).toBe(false); // problems are data, not notes
  });

  it('when no forecast of any source can be read, nothing is issued; the ledger keeps every problem and the operators get them listed', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-unreadable-'));
    const copy = join(dir, 'data');
    cpSync(sampleDir, copy, { recursive: true });
    const config = outputsIn(onSample(base, copy), dir);
    // Unusable is the same as late: every forecast within the look-back must be damaged for nothing to be usable.
    const forecasts = [
      'short/short_20261123.nc',
      'short/short_20261126.nc',
      'subseasonal/subs_20261123.nc',
      'subseasonal/subs_20261126.nc',
      'seasonal/seas_20261126.nc',
    ].map((f) => join(copy, f));
    for (const f of forecasts) truncateSync(f, 5000);
    const failed = await runOnce({ config, run: runContext({ log: silentLogger, issueDate: '2026-11-26' }), mode: 'exercise' }).catch(
      (e: unknown) => e,
    );
    expect(failed).toBeInstanceOf(ForelightError);
    expect((failed as ForelightError).code).toBe('no-forecast-read');
    const db = new Database(config.ledger, { readonly: true });
    try {
      expect((db.prepare('SELECT status FROM runs').get() as { status: string }).status).toBe('failed');
      const files = (
        db
          .prepare(
            "SELECT json_extract(diagnostic_json, '$.place.file') AS file FROM run_diagnostics WHERE code = 'input-truncated' ORDER BY file",
          )
          .all() as { file: string }[]
      ).map((r) => r.file);
      expect(files).toEqual([...forecasts].sort());
      expect(db.prepare('SELECT count(*) AS n FROM bulletins').get()).toEqual({ n: 0 });
    } finally {
      db.close();
    }
    const notices = filesUnder(config.delivery.outbox, '.eml');
    expect(notices).toHaveLength(1);
    const mail = await simpleParser(readFileSync(notices[0]));
    expect(mail.subject).toBe('[forelight] no forecast could be read for 2026-11-26');
    for (const f of forecasts) expect(mail.text).toContain(`- [input-truncated] ${f}: file is truncated`);
  });

  it('a missing observations file leaves skill unverified against observations but still issues', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-noobs-'));
    const copy = join(dir, 'data');
    cpSync(sampleDir, copy, { recursive: true });
    copyFileSync(join(copy, 'manifest.json'), join(copy, 'observed', 'observed_daily.nc'));
    const config = outputsIn(onSample(base, copy), dir);
    const outcome = await runOnce({ config, run: runContext({ log: silentLogger, issueDate: '2026-11-26' }), mode: 'exercise' });
    expect(outcome.exitCode).toBe(EXIT.inputProblem);
    expect(filesUnder(config.delivery.outbox, '.eml').length).toBeGreaterThan(0);
    const db = new Database(config.ledger, { readonly: true });
    try {
      const skills = db
        .prepare("SELECT DISTINCT json_extract(skill_json, '$.basis') AS basis FROM probabilities WHERE skill_json IS NOT NULL")
        .all() as { basis: string }[];
      expect(skills.map((s) => s.basis)).toEqual(['potential']); // perfect-model estimate, labelled as such
    } finally {
      db.close();
    }
  });

  it('a hindcast on another grid is named and left out for its regions; the other years still calibrate', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-grid-'));
    const copy = join(dir, 'data');
    cpSync(sampleDir, copy, { recursive: true });
    // The 2010 sub-seasonal hindcast replaced by the short-range one of 2010 (0.5° instead of 1°).
    copyFileSync(join(copy, 'short', 'hindcast', 'short_20101126.nc'), join(copy, 'subseasonal', 'hindcast', 'subs_20101126.nc'));
    const config = outputsIn(onSample(base, copy), dir);
    const outcome = await runOnce({ config, run: runContext({ log: silentLogger, issueDate: '2026-11-26' }), mode: 'exercise' });
    expect(outcome.exitCode).toBe(EXIT.inputProblem);
    const db = new Database(config.ledger, { readonly: true });
    try {
      const problems = (
        db.prepare("SELECT diagnostic_json FROM run_diagnostics WHERE code = 'hindcast-grid'").all() as { diagnostic_json: string }[]
      ).map((p) => formatDiagnostic(JSON.parse(p.diagnostic_json) as Diagnostic));
      expect(problems.join('\n')).toMatch(
        /subs_20101126\.nc: region 'kessan-lowlands' covers \d+ grid cells here but \d+ in the forecast: the hindcast grid differs/,
      );
      const weeks = db.prepare("SELECT count(*) AS n FROM probabilities WHERE tier = 'weeks' AND calibrated = 1").get() as { n: number };
      expect(weeks.n).toBeGreaterThan(0);
    } finally {
      db.close();
    }
  });
});
