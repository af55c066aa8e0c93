/**
 * `run --dry-run` on the invented Veloria sample with a real SQLite ledger and a real SMTP server on loopback (npm
 * smtp-server): the rehearsal reads, decides, renders and checks consistency like a run, and the SMTP server receives
 * nothing, the ledger file stays byte for byte the same (sha256), and no archive entry or outbox appears. What it
 * says it would issue is then what the real run of the same date issues (the regions' stages the bulletins carry).
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import { EXIT } from '../../src/core/exit-codes.ts';
import { stageTitle } from '../../src/decide/types.ts';
import { runOnce } from '../../src/pipeline/run-once.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { startSmtp, type SmtpFixture } from '../deliver/fixtures.ts';
import { onSample, outputsIn } from '../support/sample-run-config.ts';

let sampleDir: string;
let base: Config;
let smtp: SmtpFixture;

beforeAll(async () => {
  sampleDir = mkdtempSync(join(tmpdir(), 'forelight-sample-'));
  await generateSample(sampleDir);
  base = await loadConfig();
  smtp = await startSmtp();
}, 120_000);
afterAll(() => smtp?.close());

/** The shipped config on the generated sample, its outputs in a fresh folder, mail to the loopback server. */
function isolated(): Config {
  const config = outputsIn(onSample(base, sampleDir), mkdtempSync(join(tmpdir(), 'forelight-dry-')));
  return { ...config, delivery: { ...config.delivery, smtp: { host: '127.0.0.1', port: smtp.port, security: 'none', timeoutSeconds: 5 } } };
}

const run = (config: Config, issueDate: string, dryRun: boolean) =>
  runOnce({
    config,
    run: runContext({ log: silentLogger, issueDate, dryRun, now: () => new Date(`${issueDate}T07:30:00Z`) }),
    mode: 'exercise',
  });

const sha256 = (file: string) => createHash('sha256').update(readFileSync(file)).digest('hex');

describe('forelight run --dry-run', () => {
  it('before any run: says what it would issue to whom, and leaves no ledger, archive, outbox or mail', async () => {
    const config = isolated();
    const before = smtp.received.length;
    const outcome = await run(config, '2026-11-23', true);
    expect(outcome.summary).toMatch(/^dry run for 2026-11-23 \(nothing stored, archived or sent\): would issue short 2026-11-23/);
    expect(outcome.summary).toContain('region stages (no bulletin issued yet):');
    for (const r of config.regions) expect(outcome.summary).toContain(`  ${r.name}: `);
    const recipients = [...new Set(config.teams.flatMap((t) => t.recipients))].sort();
    expect(outcome.summary).toContain(`message(s) by e-mail: ${recipients.join(', ')}`);
    // The first date lacks the monthly seasonal forecast: the same input problem a real run reports (exit 3).
    expect(outcome.exitCode).toBe(EXIT.inputProblem);
    expect(outcome.summary).toContain('operator notice: input problems in the run of 2026-11-23');
    expect(smtp.received.length).toBe(before);
    for (const p of [config.ledger, config.delivery.archive, config.delivery.outbox]) expect(existsSync(p)).toBe(false);
  }, 240_000);

  it('after a real run: the ledger file is unchanged (sha256, rows), no mail, no new archive entry; the real run then issues the stages it named', async () => {
    const config = isolated();
    await run(config, '2026-11-23', false);
    const mailed = smtp.received.length;
    expect(mailed).toBeGreaterThan(0);
    const ledgerHash = sha256(config.ledger);
    const archived = readdirSync(config.delivery.archive).sort();

    const dry = await run(config, '2026-11-26', true);
    expect(dry.summary).toContain('region stages (against the last issued bulletin):');
    expect(smtp.received.length).toBe(mailed);
    expect(sha256(config.ledger)).toBe(ledgerHash);
    expect(readdirSync(config.delivery.archive).sort()).toEqual(archived);
    const rows = new Database(config.ledger, { readonly: true });
    expect(rows.prepare('SELECT count(*) AS n FROM runs').get()).toEqual({ n: 1 });
    rows.close();

    const real = await run(config, '2026-11-26', false);
    expect(smtp.received.length).toBeGreaterThan(mailed);
    // Each region's stage in the dry run is the one the real run's archive entry carries (the file read as plain JSON).
    const db = new Database(config.ledger, { readonly: true });
    expect(db.prepare('SELECT count(*) AS n FROM runs').get()).toEqual({ n: 2 });
    db.close();
    expect(dry.exitCode).toBe(real.exitCode); // same input problems found by the rehearsal and the run
    expect(dry.problems).toEqual(real.problems);
    const [entryDir] = readdirSync(config.delivery.archive).filter(
      (d) => !archived.includes(d) && existsSync(join(config.delivery.archive, d, 'entry.json')),
    );
    const entry = JSON.parse(readFileSync(join(config.delivery.archive, entryDir, 'entry.json'), 'utf8')) as {
      regions: { id: string; stageId: string }[];
    };
    const stages = entry.regions.map((r) => ({ region: r.id, stageId: r.stageId }));
    expect(stages.length).toBe(config.regions.length);
    for (const s of stages) {
      const name = config.regions.find((r) => r.id === s.region)!.name;
      const line = dry.summary.split('\n').find((l) => l.startsWith(`  ${name}: `))!;
      expect(line).toMatch(
        new RegExp(
          `(→ ${escape(stageTitle(config.stages, s.stageId))}  \\(|: ${escape(stageTitle(config.stages, s.stageId))} \\(unchanged\\))`,
        ),
      );
    }
  }, 480_000);
});

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
