/**
 * `smtp: null` (the embedded default): every bulletin × recipient becomes an RFC 5322 `.eml` (parsed back with
 * npm mailparser) and an `.html` in the outbox folder. File names cannot escape the folder. An unwritable
 * outbox gives one clear line and loses nothing (deliveries stay pending).
 */
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { simpleParser } from 'mailparser';
import { afterEach, describe, expect, it } from 'vitest';
import { deliverPending } from '../../src/deliver/deliver-pending.ts';
import { sendOperatorNotice } from '../../src/deliver/operator-notice.ts';
import { htmlWithInlineImages, outboxBaseName, safeNamePart, writeOutboxFiles } from '../../src/deliver/outbox.ts';
import { recordBulletins } from '../../src/ledger/bulletins.ts';
import { listDeliveries, pendingDeliveries } from '../../src/ledger/deliveries.ts';
import { openLedger, type Ledger } from '../../src/ledger/open-ledger.ts';
import { beginRun } from '../../src/ledger/runs.ts';
import { silentLogger } from '../../src/core/log.ts';
import { ADDR, deliveryConfig, sampleBulletin, sampleBulletins, smtpError, startSmtp, tempDir } from './fixtures.ts';

const ledgers: Ledger[] = [];
afterEach(() => {
  for (const l of ledgers.splice(0)) l.close();
});

function freshLedger(dir: string): Ledger {
  const ledger = openLedger(join(dir, 'ledger.sqlite'));
  ledgers.push(ledger);
  return ledger;
}

describe('outbox delivery (smtp: null)', () => {
  it('writes one CRLF .eml (RFC 5322 §2.1) and one .html per bulletin × recipient', async () => {
    const dir = tempDir('outbox');
    const ledger = freshLedger(dir);
    const runId = beginRun(ledger, '2026-11-30').run.id;
    recordBulletins(ledger, runId, sampleBulletins('2026-11-30'));
    const outbox = join(dir, 'outbox');
    const summary = await deliverPending(ledger, deliveryConfig(null, outbox), silentLogger);
    expect(summary).toMatchObject({ outbox: 5, sent: 0, failed: 0, pending: 0 });
    const files = readdirSync(outbox).sort();
    expect(files.filter((f) => f.endsWith('.eml'))).toHaveLength(5);
    expect(files.filter((f) => f.endsWith('.html'))).toHaveLength(5);
    const eml = readFileSync(join(outbox, `${outboxBaseName('2026-11-30', runId, 'tulva-health', ADDR('tulva.veille'))}.eml`));
    expect(eml.toString('latin1')).not.toMatch(/[^\r]\n/); // every line ends CRLF
    const mail = await simpleParser(eml);
    expect(mail.to).toMatchObject({ text: ADDR('tulva.veille') });
    expect(mail.subject).toBe('Heat outlook for tulva-health — forecast of 2026-11-30');
    expect(mail.attachments[0].cid).toBe('chart-tulva-health@forelight');
    expect(listDeliveries(ledger, { statuses: ['outbox'] }).every((d) => d.outboxPath?.endsWith('.eml'))).toBe(true);
  });

  it('two long addresses of one team that differ only at the end get files of their own, within 255 bytes', () => {
    const key = '2026-11-30T00:00:00Z_weeks-ensemble_2026-11-30T00:00:00Z_days-ensemble';
    const [a, b] = ['duty-officer-a', 'duty-officer-b'].map((who) =>
      outboxBaseName(key, 12, 'kessan-health-and-emergency-response-team', `${'x'.repeat(40)}.${who}@health.veloria.example`),
    );
    const dir = tempDir('long-names');
    const paths = [a, b].map((base) => writeOutboxFiles(dir, base, [{ ext: 'eml', content: base }])[0]);
    expect(new Set(paths).size).toBe(2);
    expect(readdirSync(dir).sort()).toEqual([`${a}.eml`, `${b}.eml`].sort());
    expect(`${a}.html`.length).toBeLessThanOrEqual(255);
  });

  it('team names and addresses cannot traverse out of the outbox folder', async () => {
    expect(safeNamePart('../../etc/passwd')).toBe('etc-passwd');
    expect(safeNamePart('..')).toBe('x');
    const dir = tempDir('traverse');
    const ledger = freshLedger(dir);
    const runId = beginRun(ledger, '2026-11-30').run.id;
    recordBulletins(ledger, runId, [sampleBulletin('../../../escape', ['../x@health.veloria.example'], '2026-11-30')]);
    const outbox = join(dir, 'outbox');
    await deliverPending(ledger, deliveryConfig(null, outbox), silentLogger);
    expect(readdirSync(dir).sort()).toEqual(['ledger.sqlite', 'ledger.sqlite-shm', 'ledger.sqlite-wal', 'outbox']);
    expect(readdirSync(outbox)).toHaveLength(2);
  });

  it('an outbox whose parent is a file: one-line error naming the folder, deliveries stay pending', async () => {
    // chmod cannot stop root (tests run as root in CI), but nobody can create a folder under a regular file (ENOTDIR).
    const dir = tempDir('blocked');
    const ledger = freshLedger(dir);
    writeFileSync(join(dir, 'not-a-dir'), 'x');
    const outbox = join(dir, 'not-a-dir', 'outbox');
    recordBulletins(ledger, beginRun(ledger, '2026-11-30').run.id, sampleBulletins('2026-11-30'));
    const err = await deliverPending(ledger, deliveryConfig(null, outbox), silentLogger).catch((e: Error) => e);
    expect((err as Error).message).toBe(
      `outbox folder ${outbox} is not writable (ENOTDIR) — part of the path ${outbox} is a file, not a folder: fix the path in the config (delivery.outbox); unsent bulletins stay pending in the ledger`,
    );
    expect(pendingDeliveries(ledger)).toHaveLength(5);
    const later = await deliverPending(ledger, deliveryConfig(null, join(dir, 'outbox')), silentLogger);
    expect(later.outbox).toBe(5);
  });

  it('SMTP rejection with an unwritable outbox keeps the delivery pending and says so to the operators', async () => {
    const smtp = await startSmtp({ rcpt: (a) => (a === ADDR('desk') ? smtpError(550, 'no such user') : null) });
    try {
      const dir = tempDir('blocked-smtp');
      const ledger = freshLedger(dir);
      writeFileSync(join(dir, 'file'), 'x');
      recordBulletins(ledger, beginRun(ledger, '2026-11-30').run.id, sampleBulletins('2026-11-30'));
      const summary = await deliverPending(ledger, deliveryConfig(smtp.port, join(dir, 'file', 'outbox')), silentLogger);
      expect(summary).toMatchObject({ sent: 4, pending: 1 });
      expect(pendingDeliveries(ledger).map((d) => d.recipient)).toEqual([ADDR('desk')]);
      const notice = smtp.received.find((m) => m.to.includes(ADDR('ops')))!;
      expect((await simpleParser(notice.raw)).text).toMatch(
        /desk@health\.veloria\.example .*: pending; .*550.* — still pending, retried at the next run/,
      );
    } finally {
      await smtp.close();
    }
  });

  it('sendOperatorNotice without SMTP writes the notice to the outbox', async () => {
    const dir = tempDir('notice');
    const result = await sendOperatorNotice(
      deliveryConfig(null, join(dir, 'outbox')),
      'no new forecast for 2026-11-30',
      'No source delivered a forecast newer than 2026-11-26; no bulletin was sent.',
    );
    expect(result.status).toBe('outbox');
    const mail = await simpleParser(readFileSync(result.detail));
    expect(mail.subject).toBe('[forelight] no new forecast for 2026-11-30');
    expect(mail.to).toMatchObject({ text: ADDR('ops') });
  });
});

describe('outbox .html copy', () => {
  it('replaces cid: image references by data: URLs of the attachments (RFC 2392 cid, RFC 2397 data URL)', () => {
    const png = Uint8Array.from([0x89, 0x50, 0x4e, 0x47]);
    const html = htmlWithInlineImages({
      html: '<img src="cid:chart-1@forelight"><img src="cid:chart-1@forelight">',
      attachments: [{ cid: 'chart-1@forelight', filename: 'c.png', contentType: 'image/png', content: png }],
    });
    expect(html).toBe('<img src="data:image/png;base64,iVBORw=="><img src="data:image/png;base64,iVBORw==">');
  });
});
