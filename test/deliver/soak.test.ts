/**
 * Soak: 50 simulated scheduled runs over varying forecast keys, bulletins and recipients against a real SMTP
 * server (npm smtp-server) with seeded faults — permanent 550 rejections, transient 451 replies, dropped
 * connections, silent servers (timeouts) — and seeded crashes at random points (an exception thrown from the
 * step hook leaves the ledger exactly as a killed process would: the claim stays `sending`). Restarts resume
 * the same key (or move on to the next, superseding). Ends with zero duplicates and zero losses.
 * The PRNG is mulberry32 (common practice, no source); seed fixed so failures reproduce.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listDeliveries } from '../../src/ledger/deliveries.ts';
import { openLedger } from '../../src/ledger/open-ledger.ts';
import { silentLogger } from '../../src/core/log.ts';
import type { Bulletin } from '../../src/bulletin-types.ts';
import { mulberry32 } from '../support/rng.ts';
import { ADDR, deliveryConfig, issueForecast, sampleBulletin, smtpError, startSmtp, tempDir, type SmtpFixture } from './fixtures.ts';

class Crash extends Error {}

const TEAMS = ['kessan-health', 'marrow-health', 'tulva-health', 'orrin-health', 'national-desk'];
const POOL = ['a', 'b', 'c', 'd', 'e', 'f', 'g', 'h'].map((x) => ADDR(`duty.${x}`));

let smtp: SmtpFixture;
beforeAll(async () => {
  smtp = await startSmtp();
});
afterAll(async () => {
  await smtp.close();
});

describe('soak: 50 runs with seeded faults and crashes', () => {
  it('ends with zero duplicates and zero losses in the ledger and at the server', async () => {
    const rand = mulberry32(20261126);
    const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)];
    const dir = tempDir('soak');
    const ledger = openLedger(join(dir, 'ledger.sqlite'));
    const outbox = join(dir, 'outbox');
    const cfg = deliveryConfig(smtp.port, outbox, {
      retries: 1,
      smtp: { host: '127.0.0.1', port: smtp.port, security: 'none', timeoutSeconds: 0.3 },
    });
    const rejected = new Set<string>();
    smtp.faults = {
      rcpt: (a) => (rejected.has(a) ? smtpError(550, 'mailbox unknown') : rand() < 0.12 ? smtpError(451, 'try later') : null),
      data: () => {
        const r = rand();
        return r < 0.05 ? 'drop' : r < 0.08 ? 'hang' : null;
      },
    };
    let day = Date.parse('2026-11-02T00:00:00Z');
    let key = '2026-11-02';
    let crashes = 0;
    let repeats = 0;
    let forced = 0;
    let lastCrashed = false;
    for (let run = 0; run < 50; run++) {
      const resumeAfterCrash = lastCrashed && rand() < 0.7;
      if (!resumeAfterCrash && rand() > 0.2) {
        day += (rand() < 0.5 ? 3 : 4) * 86_400_000;
        key = new Date(day).toISOString().slice(0, 10);
      } else if (!resumeAfterCrash) repeats++;
      rejected.clear();
      if (rand() < 0.3) rejected.add(pick(POOL));
      const bulletins: Bulletin[] = [];
      for (const team of TEAMS)
        if (rand() < 0.35) bulletins.push(sampleBulletin(team, [pick(POOL), pick(POOL)].slice(0, 1 + Math.floor(rand() * 2)), key));
      if (bulletins.length === 0) bulletins.push(sampleBulletin('national-desk', [pick(POOL)], key));
      const crashAt = rand() < 0.35 ? pick(['after-record', 'claimed', 'recorded']) : null;
      const force = rand() < 0.05;
      if (force) forced++;
      let steps = 0;
      const crashStep = 1 + Math.floor(rand() * 2);
      lastCrashed = false;
      try {
        await issueForecast(ledger, key, bulletins, cfg, silentLogger, {
          force,
          sleep: async () => {},
          afterRecord: () => {
            if (crashAt === 'after-record') throw new Crash();
          },
          onStep: (step) => {
            if (step === crashAt && ++steps === crashStep) throw new Crash();
          },
        });
      } catch (err) {
        if (!(err instanceof Crash)) throw err;
        crashes++;
        lastCrashed = true;
      }
    }
    // Final restart after the last run, as the service's catch-up would do.
    smtp.faults = {};
    await issueForecast(ledger, key, [], cfg, silentLogger, { sleep: async () => {} });

    const rows = listDeliveries(ledger, { statuses: ['pending', 'sending', 'sent', 'outbox', 'failed', 'superseded'] });
    ledger.close();
    const bulletinMail = smtp.received.filter((m) => !m.to.includes(ADDR('ops')));
    const copies = new Map<string, number>();
    for (const m of bulletinMail) copies.set(m.messageId, (copies.get(m.messageId) ?? 0) + 1);
    // No duplicates: every Message-ID arrived at most once.
    expect([...copies.entries()].filter(([, n]) => n > 1)).toEqual([]);
    // Every message the server holds is a `sent` row, and every `sent` row arrived.
    const sentIds = new Set(rows.filter((d) => d.status === 'sent').map((d) => d.messageId));
    expect(new Set(copies.keys())).toEqual(sentIds);
    // No losses: nothing left pending or in flight; every failed/outbox row has its copy in the outbox.
    expect(rows.filter((d) => d.status === 'pending' || d.status === 'sending')).toEqual([]);
    for (const d of rows.filter((r) => r.status === 'failed' || r.status === 'outbox')) {
      expect(d.outboxPath && existsSync(d.outboxPath), `${d.recipient} ${d.status}`).toBe(true);
      expect(sentIds.has(d.messageId)).toBe(false);
    }
    // Superseded rows never reached the server either (stale advice is not sent later).
    for (const d of rows.filter((r) => r.status === 'superseded')) expect(copies.has(d.messageId ?? '')).toBe(false);
    const byStatus = Object.fromEntries(
      ['sent', 'failed', 'outbox', 'superseded'].map((s) => [s, rows.filter((d) => d.status === s).length]),
    );
    // Operators were told of every failure, even when a crash came between the failure and the notice.
    for (const d of rows.filter((r) => r.status === 'failed' || r.status === 'outbox')) expect(d.notice, d.recipient).toBe('done');
    const notices = smtp.received.length - bulletinMail.length;
    expect(notices).toBeGreaterThan(0);
    expect(crashes).toBeGreaterThanOrEqual(5); // the seed exercises crashes, re-runs, rejections
    expect(byStatus.failed * byStatus.outbox * byStatus.superseded).toBeGreaterThan(0);
    console.info(JSON.stringify({ rows: rows.length, ...byStatus, crashes, repeats, forced, notices, received: smtp.received.length }));
  });
});
