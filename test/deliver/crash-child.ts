/**
 * Child process for crash tests: issues forecast FL_KEY from a real ledger to a real SMTP server, and when
 * FL_PAUSE_AT names a point ("after-record", "recorded:<n>", "accepted:<n>") writes FL_MARKER there and
 * waits to be killed (SIGKILL by the parent test).
 */
import { writeFileSync } from 'node:fs';
import { openLedger } from '../../src/ledger/open-ledger.ts';
import { silentLogger } from '../../src/core/log.ts';
import { deliveryConfig, issueForecast, sampleBulletins } from './fixtures.ts';

const env = process.env;
const pauseAt = env.FL_PAUSE_AT ?? '';
const pause = async (point: string) => {
  if (point !== pauseAt) return;
  writeFileSync(env.FL_MARKER!, point);
  await new Promise(() => setInterval(() => {}, 1000)); // until killed
};

const ledger = openLedger(env.FL_LEDGER!);
const counts: Record<string, number> = {};
const r = await issueForecast(
  ledger,
  env.FL_KEY!,
  sampleBulletins(env.FL_KEY),
  deliveryConfig(Number(env.FL_PORT), env.FL_OUTBOX!),
  silentLogger,
  {
    afterRecord: () => pause('after-record'),
    onStep: async (step) => {
      counts[step] = (counts[step] ?? 0) + 1;
      await pause(`${step}:${counts[step]}`);
    },
  },
);
ledger.close();
process.stdout.write(JSON.stringify({ kind: r.kind, sent: r.summary?.sent ?? 0, reclaimed: r.summary?.reclaimed ?? 0 }) + '\n');
