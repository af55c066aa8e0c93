/**
 * The input problems of a run, stored as data: one row per diagnostic with its code and severity as columns
 * (to query) and the whole diagnostic as JSON (to show again exactly as found).
 */
import { isDiagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { ForelightError } from '../core/errors.ts';
import type { Ledger } from './open-ledger.ts';
import { rowReader } from './rows.ts';

const diagnosticRows = rowReader('run_diagnostics', { position: 'integer', diagnostic_json: 'text' });

/** Replaces the stored diagnostics of `runId` with `list` (a resumed run records its own). */
export function recordDiagnostics(ledger: Ledger, runId: number, list: readonly Diagnostic[]): void {
  const insert = ledger.db.prepare(
    'INSERT INTO run_diagnostics (run_id, position, code, severity, diagnostic_json) VALUES (?, ?, ?, ?, ?)',
  );
  ledger.db.transaction(() => {
    ledger.db.prepare('DELETE FROM run_diagnostics WHERE run_id = ?').run(runId);
    list.forEach((d, i) => insert.run(runId, i, d.code, d.severity, JSON.stringify(d)));
  })();
}

/** The diagnostics of `runId` in the order they were found; a row that is not a diagnostic is an error. */
export function runDiagnostics(ledger: Ledger, runId: number): Diagnostic[] {
  const rows = ledger.db.prepare('SELECT position, diagnostic_json FROM run_diagnostics WHERE run_id = ? ORDER BY position').all(runId);
  return diagnosticRows.all(rows, ledger.path).map((row) => {
    let value: unknown;
    try {
      value = JSON.parse(row.diagnostic_json);
    } catch {
      value = undefined;
    }
    if (!isDiagnostic(value)) {
      throw new ForelightError(
        'ledger',
        'ledger-row',
        `run_diagnostics row of run ${runId} in ledger ${ledger.path} is not a diagnostic`,
        'inspect the ledger; it may have been edited by hand',
      );
    }
    return value;
  });
}
