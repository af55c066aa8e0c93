/**
 * What every stage of one pass over the inputs shares: which run (once the ledger has registered it), the
 * issue date, the clock, the logger, whether it is a dry run and the stop signal. Passed as one object instead of
 * positional options.
 */
import type { IsoDate } from '../types.ts';
import type { Logger } from './log.ts';

export interface RunContext {
  /** Ledger run id; null until the run is registered (and for commands that only look: diff, explain, skill, backtest). */
  readonly runId: number | null;
  readonly issueDate: IsoDate;
  /** The clock (tests and replays fix it). */
  readonly now: () => Date;
  readonly log: Logger;
  /**
   * A rehearsal (`forelight run --dry-run`): the same read, decide, render and consistency check as a real run, on an
   * in-memory copy of the ledger; nothing is stored, archived, put in the outbox, mailed or written to the status file.
   */
  readonly dryRun: boolean;
  /** Aborted when the service stops. */
  readonly signal: AbortSignal;
}

/** A context with the system clock, no run id, not a dry run and a signal that never aborts, unless given. */
export function runContext(init: Pick<RunContext, 'issueDate' | 'log'> & Partial<RunContext>): RunContext {
  return { runId: null, now: () => new Date(), dryRun: false, signal: new AbortController().signal, ...init };
}
