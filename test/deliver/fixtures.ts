/**
 * Test fixtures for delivery: a real SMTP server on 127.0.0.1 (npm smtp-server) with scriptable faults,
 * bulletins in the Veloria sample world, and the "issue one forecast" sequence the pipeline performs.
 */
import { mkdtempSync } from 'node:fs';
import { createServer, type Server, type Socket } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SMTPServer, type SMTPServerSession } from 'smtp-server';
import type { DeliveryConfig } from '../../src/config/service-config.ts';
import { deliverPending, type DeliverOptions, type DeliverySummary } from '../../src/deliver/deliver-pending.ts';
import { recordBulletins, hasBulletins } from '../../src/ledger/bulletins.ts';
import { deliveryCounts } from '../../src/ledger/deliveries.ts';
import type { Ledger } from '../../src/ledger/open-ledger.ts';
import { beginRun, finishRun } from '../../src/ledger/runs.ts';
import type { Logger } from '../../src/core/log.ts';
import { EXIT, exitCodeForDeliveries } from '../../src/core/exit-codes.ts';
import type { Bulletin } from '../../src/bulletin-types.ts';

export const tempDir = (prefix: string) => mkdtempSync(join(tmpdir(), `forelight-${prefix}-`));

/** A 1×1 PNG (PNG specification, ISO/IEC 15948:2004: signature, IHDR, IDAT, IEND). */
export const PNG_1X1 = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==',
  'base64',
);

export function sampleBulletin(team: string, to: readonly string[], forecastKey = '2026-11-26', locale = 'en'): Bulletin {
  return {
    id: `${forecastKey}-${team}`,
    team,
    locale,
    to,
    subject: `Heat outlook for ${team} — forecast of ${forecastKey}`,
    html: `<html><body><h1>${team}</h1><p>Stage: Brace ◑</p><img src="cid:chart-${team}@forelight" alt="chart"></body></html>`,
    text: `${team}\nStage: Brace ◑\n`,
    attachments: [{ cid: `chart-${team}@forelight`, filename: 'chart.png', contentType: 'image/png', content: new Uint8Array(PNG_1X1) }],
  };
}

export const ADDR = (local: string) => `${local}@health.veloria.example`;

export function sampleBulletins(forecastKey = '2026-11-26'): Bulletin[] {
  return [
    sampleBulletin('kessan-health', [ADDR('kessan.duty'), ADDR('kessan.lead')], forecastKey),
    sampleBulletin('tulva-health', [ADDR('tulva.veille')], forecastKey, 'fr'),
    sampleBulletin('national-desk', [ADDR('desk'), ADDR('desk.deputy')], forecastKey),
  ];
}

export function deliveryConfig(port: number | null, outbox: string, overrides: Partial<DeliveryConfig> = {}): DeliveryConfig {
  return {
    from: 'Forelight <forelight@health.veloria.example>',
    smtp: port === null ? null : { host: '127.0.0.1', port, security: 'none', timeoutSeconds: 2 },
    outbox,
    archive: join(outbox, '..', 'archive'),
    operators: [ADDR('ops')],
    retries: 2,
    retryBaseSeconds: 0.01,
    ...overrides,
  };
}

export interface Received {
  /** Whether the session was encrypted (implicit TLS or after STARTTLS) and who authenticated. */
  readonly secure: boolean;
  readonly user: string | null;
  readonly from: string;
  readonly to: readonly string[];
  readonly raw: Buffer;
  readonly messageId: string;
}

export interface Faults {
  /** Reply to RCPT TO: an Error with responseCode (e.g. 550) rejects that address. */
  rcpt?: (address: string) => (Error & { responseCode?: number }) | null;
  /** At end of DATA: 'drop' closes the socket without a reply, 'hang' never replies; an Error replies with its code. */
  data?: (to: readonly string[]) => 'drop' | 'hang' | (Error & { responseCode?: number }) | null;
}

export const smtpError = (code: number, text: string) => Object.assign(new Error(text), { responseCode: code });

export interface SmtpFixture {
  readonly port: number;
  readonly received: Received[];
  faults: Faults;
  close(): Promise<void>;
}

/**
 * `security`: 'none' (plain), 'starttls' (STARTTLS offered), 'tls' (implicit TLS) — both with smtp-server's
 * built-in self-signed certificate. `auth`: require AUTH PLAIN/LOGIN with this user and password.
 */
export async function startSmtp(
  faults: Faults = {},
  options: { security?: 'none' | 'starttls' | 'tls'; auth?: { user: string; pass: string } } = {},
): Promise<SmtpFixture> {
  const received: Received[] = [];
  const fixture = { port: 0, received, faults, close: async () => {} };
  const security = options.security ?? 'none';
  const server: SMTPServer = new SMTPServer({
    secure: security === 'tls',
    authOptional: !options.auth,
    disabledCommands: [...(security === 'starttls' ? [] : ['STARTTLS']), ...(options.auth ? [] : ['AUTH'])],
    onAuth(auth, _session, callback) {
      if (auth.username === options.auth?.user && auth.password === options.auth?.pass) return callback(null, { user: auth.username });
      callback(Object.assign(new Error('invalid credentials'), { responseCode: 535 }));
    },
    logger: false,
    disableReverseLookup: true,
    onRcptTo(address, _session, callback) {
      callback(fixture.faults.rcpt?.(address.address) ?? undefined);
    },
    onData(stream, session: SMTPServerSession, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const to = session.envelope.rcptTo.map((r) => r.address);
        const fault = fixture.faults.data?.(to) ?? null;
        if (fault === 'drop') {
          const conns = (server as unknown as { connections: Set<{ session: SMTPServerSession; _socket: Socket }> }).connections;
          for (const c of conns) if (c.session?.id === session.id) c._socket.destroy();
          return;
        }
        if (fault === 'hang') return;
        if (fault) return callback(fault);
        const raw = Buffer.concat(chunks);
        const messageId = /^Message-ID:\s*(<[^>]+>)/im.exec(raw.toString('utf8'))?.[1] ?? '';
        received.push({
          secure: session.secure,
          user: (session.user as string | undefined) ?? null,
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to,
          raw,
          messageId,
        });
        callback();
      });
    },
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  fixture.port = (server.server.address() as { port: number }).port;
  fixture.close = () => new Promise<void>((resolve) => server.close(() => resolve()));
  return fixture;
}

/** A TCP server that accepts and never says anything (SMTP greeting timeout). */
export async function startSilentServer(): Promise<{ port: number; close(): Promise<void> }> {
  const sockets = new Set<Socket>();
  const server: Server = createServer((s) => {
    sockets.add(s);
    s.on('error', () => {});
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  return {
    port: (server.address() as { port: number }).port,
    close: () =>
      new Promise<void>((resolve) => {
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
  };
}

/** A port on which nothing listens (connection refused). */
export async function refusedPort(): Promise<number> {
  const s = await startSilentServer();
  await s.close();
  return s.port;
}

/**
 * What the pipeline does for one forecast key: begin (or resume) the run, store bulletins before sending,
 * deliver, finish. `afterRecord` runs between storing and sending (crash point in tests).
 */
export async function issueForecast(
  ledger: Ledger,
  key: string,
  bulletins: readonly Bulletin[],
  delivery: DeliveryConfig,
  log: Logger,
  options: DeliverOptions & { force?: boolean; afterRecord?: () => Promise<void> | void } = {},
): Promise<{ kind: string; runId: number; summary: DeliverySummary | null }> {
  const begun = beginRun(ledger, key, { force: options.force });
  if (begun.kind === 'already-issued') return { kind: begun.kind, runId: begun.run.id, summary: null };
  const runId = begun.run.id;
  if (!hasBulletins(ledger, runId)) recordBulletins(ledger, runId, bulletins);
  await options.afterRecord?.();
  const summary = await deliverPending(ledger, delivery, log, { ...options, runId });
  const ok = exitCodeForDeliveries(deliveryCounts(ledger, runId), delivery.smtp !== null) === EXIT.ok;
  finishRun(ledger, runId, ok ? 'ok' : 'partial');
  return { kind: begun.kind, runId, summary };
}
