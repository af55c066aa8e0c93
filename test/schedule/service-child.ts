/**
 * Child process for the SIGTERM test: runs the service every second; each run writes FL_MARKER and takes
 * 400 ms. The parent sends SIGTERM during a run; the run must finish and the status file be written.
 */
import { appendFileSync } from 'node:fs';
import { createLogger } from '../../src/core/log.ts';
import { EXIT } from '../../src/core/exit-codes.ts';
import { runService } from '../../src/schedule/run-service.ts';

const env = process.env;
await runService({
  config: { ledger: env.FL_LEDGER!, schedule: { cron: '* * * * * *', timezone: 'Europe/Lisbon', waitForDataMinutes: 0, pollSeconds: 1 } },
  log: createLogger({ level: 'warn' }),
  lastCompletedAt: () => new Date(),
  runOnce: async (ctx) => {
    appendFileSync(env.FL_MARKER!, 'start\n');
    await new Promise((r) => setTimeout(r, 400));
    appendFileSync(env.FL_MARKER!, `end aborted=${ctx.signal.aborted}\n`);
    return { exitCode: EXIT.ok, summary: 'child run' };
  },
});
appendFileSync(env.FL_MARKER!, 'stopped\n');
