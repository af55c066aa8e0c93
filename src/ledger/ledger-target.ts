/**
 * Where the configured ledger is, for the commands that open it: the password of a PostgreSQL ledger from the
 * environment variable named by `ledger-password-env`, and a local file prefix for this machine's lock and status
 * files (beside a SQLite ledger; in `.forelight/` beside the config for a PostgreSQL one, which has no local file).
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import type { Config } from '../config/types.ts';
import { ForelightError } from '../core/errors.ts';
import { openLedger, type Ledger } from './open-ledger.ts';
import { isPostgresUrl } from './sql-db.ts';

/** The ledger settings of a `Config` (`file` only to place local state of a PostgreSQL ledger; else the working folder). */
export type LedgerSettings = Pick<Config, 'ledger'> & Partial<Pick<Config, 'file' | 'ledgerPasswordEnv'>>;

export function ledgerPassword(config: LedgerSettings, env: NodeJS.ProcessEnv = process.env): string | undefined {
  if (!isPostgresUrl(config.ledger) || !config.ledgerPasswordEnv) return undefined;
  const value = env[config.ledgerPasswordEnv];
  if (value === undefined) {
    throw new ForelightError(
      'ledger',
      'ledger-password-missing',
      `environment variable ${config.ledgerPasswordEnv} (ledger-password-env) is not set`,
      'export it with the PostgreSQL password, or remove ledger-password-env when the server needs none',
    );
  }
  return value;
}

export function openConfiguredLedger(config: LedgerSettings, options: { now?: () => Date; env?: NodeJS.ProcessEnv } = {}): Ledger {
  return openLedger(config.ledger, { now: options.now, password: ledgerPassword(config, options.env) });
}

/** False only for a SQLite ledger whose file does not exist yet (nothing run); a PostgreSQL ledger is asked. */
export const ledgerMayHoldRuns = (config: LedgerSettings): boolean => isPostgresUrl(config.ledger) || existsSync(config.ledger);

/** Prefix of this machine's `<prefix>.lock` and `<prefix>.status.json` (its folder is created for a PostgreSQL ledger). */
export function localStatePrefix(config: LedgerSettings): string {
  if (!isPostgresUrl(config.ledger)) return config.ledger;
  const id = createHash('sha256').update(config.ledger).digest('hex').slice(0, 12);
  const folder = join(config.file ? dirname(config.file) : process.cwd(), '.forelight');
  mkdirSync(folder, { recursive: true });
  return join(folder, `ledger-${id}`);
}
