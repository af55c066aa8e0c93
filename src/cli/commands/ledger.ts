/**
 * `forelight ledger migrate`: bring the configured ledger (SQLite file or PostgreSQL database) to this Forelight's
 * schema and say which version it had and has. Every command also migrates on opening; this is for a PostgreSQL
 * ledger shared by several machines, migrated once before the new version is rolled out to the others.
 */
import { loadConfig } from '../../config/load-config.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { ledgerPassword } from '../../ledger/ledger-target.ts';
import { openLedger } from '../../ledger/open-ledger.ts';
import { applyMigrations } from '../../ledger/migrations.ts';
import { stringOption, usageError, type ParsedArgs } from '../args.ts';

export async function ledgerCommand(args: ParsedArgs): Promise<number> {
  const [action] = args.positionals;
  if (action !== 'migrate') throw usageError(`unknown ledger action '${action ?? ''}': use "forelight ledger migrate"`);
  const config = await loadConfig(stringOption(args, 'config'));
  const ledger = openLedger(config.ledger, { password: ledgerPassword(config), migrate: false });
  try {
    const { from, to } = applyMigrations(ledger.db, ledger.path);
    const what = from === to ? 'already up to date' : `migrated from version ${from}`;
    process.stdout.write(`ledger ${ledger.path} (${ledger.db.dialect}): schema version ${to}, ${what}\n`);
  } finally {
    ledger.close();
  }
  return EXIT.ok;
}
