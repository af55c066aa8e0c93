/**
 * A bulletin that contradicts itself, end to end through `runOnce` (issue: a contradiction is a bug, logged as an
 * error, never called an input problem). The Veloria sample is issued once (real NetCDF files, real SQLite ledger,
 * outbox delivery) with one contradiction seeded into what the bulletins show: the region view builder is wrapped so
 * that the first row with a number of every region says a probability word that is not the configured one. The
 * real consistency checker inside the render must find it; the run then exits 7 (EXIT.contradiction), its summary
 * says "bulletin contradiction … a bug" and does not count it among the input problems (the first sample date has
 * one real one: no seasonal forecast yet, so both kinds are seen apart), the finding is an error in the ledger, and
 * the operator notice about it speaks of a bug while the input-problem notice does not list it.
 */
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { EXIT } from '../../src/core/exit-codes.ts';
import { silentLogger } from '../../src/core/log.ts';
import { runContext } from '../../src/core/run-context.ts';
import { runDiagnostics } from '../../src/ledger/diagnostics.ts';
import { openLedger } from '../../src/ledger/open-ledger.ts';
import { runOnce, type RunOutcome } from '../../src/pipeline/run-once.ts';
import type { RegionView } from '../../src/render/region-view.ts';
import { generateSample } from '../../src/sample/generate.ts';

const SEEDED_WORD = 'seeded-wrong-word';

vi.mock('../../src/render/region-view.ts', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/render/region-view.ts')>();
  return {
    ...real,
    buildRegionView: (...args: Parameters<typeof real.buildRegionView>): RegionView => {
      const view = real.buildRegionView(...args);
      const tierIndex = view.tiers.findIndex((tv) => tv.leads.some((l) => Number.isFinite(l.probability)));
      if (tierIndex < 0) return view;
      return {
        ...view,
        tiers: view.tiers.map((tv, i) => {
          if (i !== tierIndex) return tv;
          const lead = tv.leads.findIndex((l) => Number.isFinite(l.probability));
          return { ...tv, leads: tv.leads.map((l, j) => (j === lead ? { ...l, word: SEEDED_WORD } : l)) };
        }),
      };
    },
  };
});

const ISSUE = '2026-11-23';
let config: Config;
let outcome: RunOutcome;

beforeAll(async () => {
  const tmp = (p: string) => mkdtempSync(join(tmpdir(), `forelight-contradiction-${p}-`));
  const sampleDir = tmp('sample');
  await generateSample(sampleDir);
  const base = await loadConfig();
  const out = tmp('out');
  const sample = (p: string) => p.replace(/.*sample-inputs\/data/, sampleDir);
  config = {
    ...base,
    sources: base.sources.map((s) => ({ ...s, forecast: s.forecast.map(sample), hindcast: s.hindcast && sample(s.hindcast) })),
    observations: base.observations && { ...base.observations, path: sample(base.observations.path) },
    ledger: join(out, 'ledger.sqlite'),
    delivery: { ...base.delivery, smtp: null, outbox: join(out, 'outbox'), archive: join(out, 'archive') },
    calibration: { ...base.calibration, cacheDir: join(out, 'cache') },
  };
  outcome = await runOnce({
    config,
    run: runContext({ log: silentLogger, issueDate: ISSUE, now: () => new Date(`${ISSUE}T07:30:00Z`) }),
    mode: 'exercise',
  });
}, 600_000);

describe('a run whose bulletins contradict themselves', () => {
  it('exits 7 (bulletin contradiction), not 3 (input problem), and says it is a bug', () => {
    expect(outcome.exitCode, outcome.summary).toBe(EXIT.contradiction);
    const counts = /; (\d+) input problem\(s\); (\d+) bulletin contradiction\(s\), a bug in Forelight: report it with run\.json/.exec(
      outcome.summary,
    );
    expect(counts, outcome.summary).not.toBeNull();
    expect(Number(counts?.[1])).toBe(outcome.problems?.length);
    expect(Number(counts?.[2])).toBe(outcome.contradictions?.length);
    expect(outcome.problems?.some((p) => p.includes(SEEDED_WORD))).toBe(false);
    expect(outcome.contradictions?.length).toBeGreaterThan(0);
    expect(outcome.contradictions?.every((c) => c.includes(`says "${SEEDED_WORD}"`) && c.includes(': words: '))).toBe(true);
  });

  it('the finding is an error in the ledger and in run.json, the bulletins were delivered', () => {
    const ledger = openLedger(config.ledger);
    try {
      const found = runDiagnostics(ledger, outcome.runId as number).filter((d) => d.message.includes(SEEDED_WORD));
      expect(found).toHaveLength(outcome.contradictions?.length ?? -1);
      expect(found.every((d) => d.code === 'bulletin-contradiction' && d.severity === 'error')).toBe(true);
    } finally {
      ledger.close();
    }
    const files = readdirSync(config.delivery.outbox);
    const recipients = config.teams.reduce((n, t) => n + t.recipients.length, 0);
    expect(files.filter((f) => f.endsWith('.eml') && !f.startsWith('notice_'))).toHaveLength(recipients);
  });

  it('the operator notice calls it a bug in Forelight; the input-problem notice does not list it', () => {
    const notices = readdirSync(config.delivery.outbox)
      .filter((f) => f.startsWith('notice_'))
      .map((f) => readFileSync(join(config.delivery.outbox, f), 'utf8'));
    expect(notices.some((n) => /bulletin contradiction in the run of/.test(n) && /bug in Forelight/.test(n))).toBe(true);
    const inputNotices = notices.filter((n) => /input problems in the run of/.test(n));
    expect(inputNotices.length).toBeGreaterThan(0);
    expect(inputNotices.some((n) => n.includes(SEEDED_WORD) || n.includes('bulletin-contradiction'))).toBe(false);
  });
});
