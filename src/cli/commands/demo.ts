/**
 * `forelight demo`: the sample scenario end to end with the embedded configuration. Generates the invented
 * Veloria inputs when missing, starts from an empty outbox, archive and ledger, and issues the three sample
 * forecast dates in order, so persistence and "what changed" show as they would over a week and a half.
 */
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { loadConfig } from '../../config/load-config.ts';
import { createLogger, levelNamed } from '../../core/log.ts';
import { runContext } from '../../core/run-context.ts';
import { packagePath } from '../../core/package-root.ts';
import { runOnce } from '../../pipeline/run-once.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { generateSample } from '../../sample/generate.ts';
import type { ParsedArgs } from '../args.ts';

/** The three sample issue dates (Mon, Thu, Mon), see sample-inputs/README.md. */
export const SAMPLE_ISSUE_DATES = ['2026-11-23', '2026-11-26', '2026-11-30'] as const;
const SAMPLE_DATA = `${packagePath('sample-inputs/data')}/`;

/** `--fresh` regenerates the sample inputs even when they exist (generateSample rewrites every file). */
export async function demoCommand(args: ParsedArgs): Promise<number> {
  const say = (line: string) => process.stdout.write(line + '\n');
  if (args.options.fresh === true || !existsSync(join(SAMPLE_DATA, 'manifest.json'))) {
    say('generating the invented Veloria sample inputs ...');
    const t0 = Date.now();
    await generateSample(SAMPLE_DATA, { onProgress: (line) => say(`  ${line}`) });
    say(`  done in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  }
  const config = await loadConfig();
  for (const path of [config.delivery.outbox, config.delivery.archive, config.ledger, `${config.ledger}-wal`, `${config.ledger}-shm`]) {
    rmSync(path, { recursive: true, force: true });
  }
  const log = createLogger({ level: levelNamed(process.env.FORELIGHT_LOG_LEVEL) ?? 'warn', base: { command: 'demo' } });
  let worst: number = EXIT.ok;
  for (const issueDate of SAMPLE_ISSUE_DATES) {
    say(`issue of ${issueDate} ...`);
    const outcome = await runOnce({
      config,
      run: runContext({ log, issueDate, now: () => new Date(`${issueDate}T07:30:00Z`) }),
      mode: 'exercise',
    });
    say(`  ${outcome.summary}`);
    if (outcome.exitCode !== EXIT.ok && outcome.exitCode !== EXIT.inputProblem) worst = outcome.exitCode;
  }
  say(`bulletins: ${config.delivery.outbox}`);
  say(`archive:   ${join(config.delivery.archive, 'index.html')}`);
  say(`ledger:    ${config.ledger}`);
  return worst;
}
