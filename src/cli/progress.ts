/**
 * Progress of long work (the analysis of diff, skill and backtest; a first-time climate build, one step per
 * hindcast start) on stderr: a one-line bar on a terminal, otherwise one JSON object per line for logs and
 * log collectors: {"time", "run", "issueDate", "stage", "done", "total", "label"} (`run` is the ledger run id, null
 * before the ledger registered the run and for commands that only look).
 */
import type { RunContext } from '../core/run-context.ts';

/** Where progress goes: stderr, or any stream with the same surface. */
export type ProgressStream = Pick<NodeJS.WriteStream, 'write' | 'isTTY' | 'columns'>;

export type ProgressReport = (done: number, total: number, label: string) => void;

const WIDTH = 24;

export function progressReporter(
  stage: string,
  run: Pick<RunContext, 'runId' | 'issueDate' | 'now'>,
  out: ProgressStream = process.stderr,
): ProgressReport {
  return (done, total, label) => {
    if (!out.isTTY) {
      const line = { time: run.now().toISOString(), run: run.runId, issueDate: run.issueDate, stage, done, total, label };
      out.write(`${JSON.stringify(line)}\n`);
      return;
    }
    const filled = total > 0 ? Math.round((Math.min(done, total) / total) * WIDTH) : WIDTH;
    const bar = `${stage} [${'#'.repeat(filled)}${'-'.repeat(WIDTH - filled)}] ${done}/${total} ${label}`;
    out.write(`\r${bar.padEnd(out.columns ?? 80)}${done >= total ? '\n' : ''}`);
  };
}

/** Progress of a first-time climate build: one step per hindcast start reduced, per source (analyse `onStartReduced`). */
export function startProgress(run: Pick<RunContext, 'runId' | 'issueDate' | 'now'>, out?: ProgressStream) {
  const report = progressReporter('calibrate', run, out);
  return (source: string, done: number, total: number): void => report(done, total, `hindcast starts of ${source} reduced`);
}
