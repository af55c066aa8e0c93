/**
 * Delivery over a real SMTP server on loopback (npm smtp-server): MIME structure checked with npm mailparser
 * against RFC 2046 (multipart/alternative text/plain + text/html) and RFC 2387 / RFC 2392 (multipart/related,
 * inline part addressed by Content-ID from a `cid:` URL). Faults: refused port, silent server, dropped
 * connection, one recipient rejected with 550 (RFC 5321 §4.2.2 reply codes: 4yz transient, 5yz permanent).
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { simpleParser } from 'mailparser';
import { afterEach, describe, expect, it } from 'vitest';
import { deliverPending, type DeliverySummary } from '../../src/deliver/deliver-pending.ts';
import { EXIT, exitCodeForDeliveries } from '../../src/core/exit-codes.ts';
import { listDeliveries, pendingDeliveries } from '../../src/ledger/deliveries.ts';
import { openLedger, type Ledger } from '../../src/ledger/open-ledger.ts';
import { silentLogger } from '../../src/core/log.ts';
import {
  ADDR,
  PNG_1X1,
  deliveryConfig,
  issueForecast,
  refusedPort,
  sampleBulletins,
  smtpError,
  startSilentServer,
  startSmtp,
  tempDir,
  type SmtpFixture,
} from './fixtures.ts';

const cleanups: (() => Promise<void> | void)[] = [];
afterEach(async () => {
  for (const c of cleanups.splice(0)) await c();
});

async function setup(faults = {}): Promise<{ smtp: SmtpFixture; ledger: Ledger; dir: string }> {
  const smtp = await startSmtp(faults);
  const dir = tempDir('smtp');
  const ledger = openLedger(join(dir, 'ledger.sqlite'));
  cleanups.push(
    () => ledger.close(),
    () => smtp.close(),
  );
  return { smtp, ledger, dir };
}

const noSleep = async () => {};

describe('deliverPending over SMTP', () => {
  it('sends one message per recipient with text, HTML and the inline PNG (RFC 2046, RFC 2392)', async () => {
    const { smtp, ledger, dir } = await setup();
    const r = await issueForecast(ledger, '2026-11-26', sampleBulletins(), deliveryConfig(smtp.port, join(dir, 'outbox')), silentLogger);
    expect(r.summary).toMatchObject({ sent: 5, failed: 0, outbox: 0, pending: 0 });
    expect(smtp.received.map((m) => m.to.join(',')).sort()).toEqual(
      [ADDR('desk'), ADDR('desk.deputy'), ADDR('kessan.duty'), ADDR('kessan.lead'), ADDR('tulva.veille')].sort(),
    );
    const kessan = smtp.received.find((m) => m.to[0] === ADDR('kessan.duty'))!;
    const mail = await simpleParser(kessan.raw, { skipImageLinks: true }); // keep cid: URLs as sent
    expect(mail.subject).toBe('Heat outlook for kessan-health — forecast of 2026-11-26');
    expect(mail.text).toContain('Stage: Brace ◑');
    expect(mail.html).toContain('<h1>kessan-health</h1>');
    expect(kessan.raw.toString()).toMatch(/Content-Type: multipart\/alternative/);
    expect(kessan.raw.toString()).toMatch(/Content-Type: multipart\/related/);
    const png = mail.attachments.find((a) => a.contentType === 'image/png')!;
    expect(png.cid).toBe('chart-kessan-health@forelight');
    expect(Buffer.compare(png.content, PNG_1X1)).toBe(0);
    expect(mail.html).toContain('src="cid:chart-kessan-health@forelight"');
    expect(mail.messageId).toBe(kessan.messageId);
    const ids = new Set(smtp.received.map((m) => m.messageId));
    expect(ids.size).toBe(5);
    expect(
      listDeliveries(ledger, { statuses: ['sent'] })
        .map((d) => d.messageId)
        .sort(),
    ).toEqual([...ids].sort());
  });

  it('re-running the same forecast key sends nothing; force sends again with new Message-IDs', async () => {
    const { smtp, ledger, dir } = await setup();
    const cfg = deliveryConfig(smtp.port, join(dir, 'outbox'));
    await issueForecast(ledger, '2026-11-26', sampleBulletins(), cfg, silentLogger);
    const again = await issueForecast(ledger, '2026-11-26', sampleBulletins(), cfg, silentLogger);
    expect(again.kind).toBe('already-issued');
    expect(smtp.received).toHaveLength(5);
    const forced = await issueForecast(ledger, '2026-11-26', sampleBulletins(), cfg, silentLogger, { force: true });
    expect(forced.kind).toBe('new');
    expect(smtp.received).toHaveLength(10);
    expect(new Set(smtp.received.map((m) => m.messageId)).size).toBe(10);
  });

  it('one rejected recipient (550) is marked failed, the others get theirs, operators are told', async () => {
    const { smtp, ledger, dir } = await setup({
      rcpt: (a: string) => (a === ADDR('kessan.lead') ? smtpError(550, '5.1.1 mailbox unknown') : null),
    });
    const outbox = join(dir, 'outbox');
    const r = await issueForecast(ledger, '2026-11-26', sampleBulletins(), deliveryConfig(smtp.port, outbox), silentLogger);
    expect(r.summary).toMatchObject({ sent: 4, failed: 1, outbox: 0 });
    const failed = listDeliveries(ledger, { statuses: ['failed'] });
    expect(failed.map((d) => d.recipient)).toEqual([ADDR('kessan.lead')]);
    expect(failed[0].attempts).toBe(1); // permanent: not retried
    expect(failed[0].lastError).toMatch(/550/);
    expect(existsSync(failed[0].outboxPath!)).toBe(true);
    const notice = smtp.received.filter((m) => m.to.includes(ADDR('ops')));
    expect(notice).toHaveLength(1);
    expect(notice[0].raw.toString()).toContain('kessan.lead@health.veloria.example');
    expect(smtp.received.filter((m) => !m.to.includes(ADDR('ops')))).toHaveLength(4);
  });

  it('a dropped connection (socket closed in DATA) is retried with backoff and then succeeds', async () => {
    let drops = 0;
    const { smtp, ledger, dir } = await setup({ data: () => (drops++ < 2 ? 'drop' : null) });
    const waits: number[] = [];
    const cfg = deliveryConfig(smtp.port, join(dir, 'outbox'), { retries: 3, retryBaseSeconds: 5 });
    await issueForecast(ledger, '2026-11-26', sampleBulletins().slice(1, 2), cfg, silentLogger, {
      sleep: async (ms) => {
        waits.push(ms);
      },
    });
    expect(waits).toEqual([5000, 10000]); // exponential: base, 2 × base
    expect(smtp.received).toHaveLength(1);
    expect(listDeliveries(ledger, { statuses: ['sent'] })).toHaveLength(1);
  });

  it('a refused port: retries exhausted → outbox copy, status outbox, operator notice in the outbox too', async () => {
    const port = await refusedPort();
    const dir = tempDir('refused');
    const ledger = openLedger(join(dir, 'ledger.sqlite'));
    cleanups.push(() => ledger.close());
    const outbox = join(dir, 'outbox');
    const waits: number[] = [];
    const r = await issueForecast(ledger, '2026-11-26', sampleBulletins().slice(0, 1), deliveryConfig(port, outbox), silentLogger, {
      sleep: async (ms) => {
        waits.push(ms);
      },
    });
    expect(r.summary).toMatchObject({ sent: 0, outbox: 2 });
    expect(waits).toHaveLength(4); // 2 retries × 2 recipients
    const rows = listDeliveries(ledger, { statuses: ['outbox'] });
    expect(rows.every((d) => d.lastError?.includes('ECONNECTION') || d.lastError?.includes('ECONNREFUSED'))).toBe(true);
    for (const d of rows) expect((await simpleParser(readFileSync(d.outboxPath!))).subject).toContain('Heat outlook for kessan-health');
    const notices = (await import('node:fs')).readdirSync(outbox).filter((f) => f.startsWith('notice_'));
    expect(notices).toHaveLength(1);
  });

  it('a server that never answers times out (greeting timeout) and is treated as temporary', async () => {
    const silent = await startSilentServer();
    const dir = tempDir('silent');
    const ledger = openLedger(join(dir, 'ledger.sqlite'));
    cleanups.push(
      () => ledger.close(),
      () => silent.close(),
    );
    const cfg = deliveryConfig(silent.port, join(dir, 'outbox'), {
      retries: 1,
      smtp: { host: '127.0.0.1', port: silent.port, security: 'none', timeoutSeconds: 0.2 },
    });
    const t0 = Date.now();
    const r = await issueForecast(ledger, '2026-11-26', sampleBulletins().slice(1, 2), cfg, silentLogger, { sleep: noSleep });
    expect(r.summary).toMatchObject({ outbox: 1 });
    expect(listDeliveries(ledger, { statuses: ['outbox'] })[0].lastError).toMatch(/ETIMEDOUT|timeout/i);
    expect(Date.now() - t0).toBeLessThan(5000);
  });

  it('a missing SMTP password stops before claiming anything: deliveries stay pending', async () => {
    const { smtp, ledger, dir } = await setup();
    const cfg = deliveryConfig(smtp.port, join(dir, 'outbox'), {
      smtp: {
        host: '127.0.0.1',
        port: smtp.port,
        security: 'none',
        timeoutSeconds: 1,
        user: 'forelight',
        passwordEnv: 'FORELIGHT_SMTP_PASSWORD',
      },
    });
    await expect(issueForecast(ledger, '2026-11-26', sampleBulletins(), cfg, silentLogger, { env: {} })).rejects.toThrow(
      'environment variable FORELIGHT_SMTP_PASSWORD is not set — export it, or remove delivery.smtp.user from the config YAML',
    );
    expect(pendingDeliveries(ledger)).toHaveLength(5);
    expect(smtp.received).toHaveLength(0);
    const later = await deliverPending(ledger, deliveryConfig(smtp.port, join(dir, 'outbox')), silentLogger);
    expect(later.sent).toBe(5);
  });

  it.each(['starttls', 'tls'] as const)(
    'security %s encrypts the session and authenticates with the password from the environment',
    async (security) => {
      // smtp-server's built-in certificate is self-signed: accept it for this test only.
      const before = process.env.NODE_TLS_REJECT_UNAUTHORIZED;
      process.env.NODE_TLS_REJECT_UNAUTHORIZED = '0';
      const smtp = await startSmtp({}, { security, auth: { user: 'forelight', pass: 's3cret' } });
      const dir = tempDir(`smtp-${security}`);
      const ledger = openLedger(join(dir, 'ledger.sqlite'));
      cleanups.push(
        () => ledger.close(),
        () => smtp.close(),
        () => {
          if (before === undefined) delete process.env.NODE_TLS_REJECT_UNAUTHORIZED;
          else process.env.NODE_TLS_REJECT_UNAUTHORIZED = before;
        },
      );
      const cfg = deliveryConfig(smtp.port, join(dir, 'outbox'), {
        smtp: {
          host: '127.0.0.1',
          port: smtp.port,
          security,
          timeoutSeconds: 2,
          user: 'forelight',
          passwordEnv: 'FORELIGHT_SMTP_PASSWORD',
        },
      });
      const r = await issueForecast(ledger, '2026-11-26', sampleBulletins().slice(1, 2), cfg, silentLogger, {
        env: { FORELIGHT_SMTP_PASSWORD: 's3cret' },
      });
      expect(r.summary).toMatchObject({ sent: 1 });
      expect(smtp.received[0]).toMatchObject({ secure: true, user: 'forelight' });
    },
  );

  it('a refused login (535, RFC 4954 §6) is a delivery failure: every copy in the outbox, exit 4, the operators told in the outbox', async () => {
    const smtp = await startSmtp({}, { auth: { user: 'forelight', pass: 'right' } });
    const dir = tempDir('smtp-auth');
    const ledger = openLedger(join(dir, 'ledger.sqlite'));
    cleanups.push(
      () => ledger.close(),
      () => smtp.close(),
    );
    const cfg = deliveryConfig(smtp.port, join(dir, 'outbox'), {
      smtp: {
        host: '127.0.0.1',
        port: smtp.port,
        security: 'none',
        timeoutSeconds: 2,
        user: 'forelight',
        passwordEnv: 'FORELIGHT_SMTP_PASSWORD',
      },
    });
    const r = await issueForecast(ledger, '2026-11-26', sampleBulletins(), cfg, silentLogger, {
      env: { FORELIGHT_SMTP_PASSWORD: 'wrong' },
    });
    expect(r.summary).toMatchObject({ sent: 0, outbox: 5, failed: 0, pending: 0 });
    expect(exitCodeForDeliveries(r.summary as DeliverySummary, true)).toBe(EXIT.deliveryFailed);
    const rows = listDeliveries(ledger, { runId: r.runId, statuses: ['pending', 'sending', 'sent', 'outbox', 'failed'] });
    expect(rows).toHaveLength(5);
    expect(rows.every((d) => d.status === 'outbox' && d.outboxPath !== null && existsSync(d.outboxPath))).toBe(true);
    expect(rows[0].lastError).toMatch(
      /^SMTP server 127\.0\.0\.1:\d+ refused the login of forelight: EAUTH 535 .* — check delivery\.smtp\.user and the password in FORELIGHT_SMTP_PASSWORD/,
    );
    const notices = readdirSync(join(dir, 'outbox')).filter((f) => f.startsWith('notice_'));
    expect(notices).toHaveLength(1);
    expect(readFileSync(join(dir, 'outbox', notices[0]), 'utf8')).toMatch(/refused the login/);
    expect(smtp.received).toHaveLength(0);
    // Nothing is sent twice: a second pass finds nothing pending.
    expect((await deliverPending(ledger, cfg, silentLogger, { env: { FORELIGHT_SMTP_PASSWORD: 'right' } })).sent).toBe(0);
  });
});
