/**
 * A real child process is SIGKILLed at chosen points of issuing a forecast, then started again; the loopback
 * SMTP server (npm smtp-server) counts copies per recipient. Exactly once everywhere except the documented
 * window between the server's final 250 reply and the ledger commit (deliver-pending.ts header).
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listDeliveries } from '../../src/ledger/deliveries.ts';
import { openLedger } from '../../src/ledger/open-ledger.ts';
import { sampleBulletins, startSmtp, tempDir, type SmtpFixture } from './fixtures.ts';

const CHILD = join(import.meta.dirname, 'crash-child.ts');
const ROOT = join(import.meta.dirname, '..', '..');
let smtp: SmtpFixture;
beforeAll(async () => {
  smtp = await startSmtp();
});
afterAll(async () => {
  await smtp.close();
});

function runChild(env: Record<string, string>): {
  done: Promise<{ code: number | null; signal: string | null; out: string }>;
  kill: () => void;
} {
  const child = spawn(process.execPath, ['--import', 'tsx', CHILD], {
    cwd: ROOT,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  child.stdout.on('data', (d) => {
    out += d;
  });
  child.stderr.on('data', (d) => {
    out += d;
  });
  const done = new Promise<{ code: number | null; signal: string | null; out: string }>((resolve) =>
    child.on('exit', (code, signal) => resolve({ code, signal, out })),
  );
  return { done, kill: () => child.kill('SIGKILL') };
}

async function waitFor(path: string, ms = 20_000): Promise<void> {
  const end = Date.now() + ms;
  while (!existsSync(path)) {
    if (Date.now() > end) throw new Error(`marker ${path} never appeared`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

/** Kill at `pauseAt`, restart, return copies received per recipient for this forecast key. */
async function killAndRestart(key: string, pauseAt: string) {
  const dir = tempDir('crash');
  const env = {
    FL_LEDGER: join(dir, 'ledger.sqlite'),
    FL_PORT: String(smtp.port),
    FL_OUTBOX: join(dir, 'outbox'),
    FL_KEY: key,
    FL_MARKER: join(dir, 'marker'),
  };
  const first = runChild({ ...env, FL_PAUSE_AT: pauseAt });
  await waitFor(env.FL_MARKER);
  first.kill();
  expect((await first.done).signal).toBe('SIGKILL');
  const second = await runChild(env).done;
  expect(second.code, second.out).toBe(0);
  const copies = new Map<string, string[]>();
  for (const m of smtp.received.filter((r) => r.raw.toString().includes(`X-Forelight-Forecast: ${key}`))) {
    copies.set(m.to[0], [...(copies.get(m.to[0]) ?? []), m.messageId]);
  }
  const ledger = openLedger(env.FL_LEDGER);
  const rows = listDeliveries(ledger, { statuses: ['pending', 'sending', 'sent', 'outbox', 'failed', 'superseded'] });
  ledger.close();
  return { copies, rows, second: JSON.parse(second.out.trim().split('\n').pop()!) as { reclaimed: number } };
}

const recipients = sampleBulletins().flatMap((b) => b.to);

describe('SIGKILL and restart (real child process)', () => {
  it('killed between rendering and sending: every recipient gets exactly one copy', async () => {
    const { copies, rows } = await killAndRestart('2026-11-23', 'after-record');
    expect([...copies.keys()].sort()).toEqual([...recipients].sort());
    for (const ids of copies.values()) expect(ids).toHaveLength(1);
    expect(rows.every((d) => d.status === 'sent')).toBe(true);
  });

  it('killed between two recipients: every recipient gets exactly one copy', async () => {
    const { copies, rows } = await killAndRestart('2026-11-26', 'recorded:2');
    expect([...copies.keys()].sort()).toEqual([...recipients].sort());
    for (const ids of copies.values()) expect(ids).toHaveLength(1);
    expect(rows.every((d) => d.status === 'sent' && d.attempts === 1)).toBe(true);
  });

  it('killed after the server accepted but before the ledger commit: one re-send, same Message-ID (documented window)', async () => {
    const { copies, rows, second } = await killAndRestart('2026-11-30', 'accepted:2');
    expect(second.reclaimed).toBe(1);
    const twice = [...copies.entries()].filter(([, ids]) => ids.length > 1);
    expect(twice).toHaveLength(1);
    expect(new Set(twice[0][1]).size).toBe(1); // same Message-ID both times
    expect([...copies.values()].reduce((n, ids) => n + ids.length, 0)).toBe(recipients.length + 1);
    expect(rows.every((d) => d.status === 'sent')).toBe(true);
  });
});
