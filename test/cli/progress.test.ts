/**
 * Progress of long work: JSON lines off a terminal, a bar on one. The JSON form is checked by parsing every line
 * with the platform's JSON.parse (ECMA-404: one JSON text per line, "JSON Lines" convention, jsonlines.org) and the
 * time with Date.parse of ISO 8601; the field set is Forelight's own (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { progressReporter, startProgress, type ProgressStream } from '../../src/cli/progress.ts';

function stream(isTTY: boolean): ProgressStream & { text: string } {
  const s = {
    text: '',
    isTTY,
    columns: 60,
    write(chunk: string | Uint8Array) {
      s.text += String(chunk);
      return true;
    },
  };
  return s as ProgressStream & { text: string };
}

const run = { runId: 42, issueDate: '2026-11-26', now: () => new Date('2026-11-26T06:00:00.000Z') };

describe('progress of long work', () => {
  it('off a terminal: one JSON object per line with time, run id, issue date, stage, done, total and label', () => {
    const out = stream(false);
    const report = progressReporter('backtest', run, out);
    report(0, 3, 'reading forecasts and observations');
    report(3, 3, 'done');
    const lines = out.text.split('\n');
    expect(lines.at(-1)).toBe(''); // every object ends its line
    const objects = lines.slice(0, -1).map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(objects).toEqual([
      {
        time: '2026-11-26T06:00:00.000Z',
        run: 42,
        issueDate: '2026-11-26',
        stage: 'backtest',
        done: 0,
        total: 3,
        label: 'reading forecasts and observations',
      },
      { time: '2026-11-26T06:00:00.000Z', run: 42, issueDate: '2026-11-26', stage: 'backtest', done: 3, total: 3, label: 'done' },
    ]);
    expect(Number.isNaN(Date.parse(objects[0].time as string))).toBe(false);
  });

  it('a first-time climate build reports each hindcast start of a source, run id null before the ledger has one', () => {
    const out = stream(false);
    const report = startProgress({ ...run, runId: null }, out);
    for (let i = 1; i <= 20; i++) report('seasonal', i, 20);
    const objects = out.text
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l) as { run: unknown; stage: string; done: number; total: number; label: string });
    expect(objects.map((o) => o.done)).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
    expect(new Set(objects.map((o) => `${o.run} ${o.stage} ${o.total} ${o.label}`))).toEqual(
      new Set(['null calibrate 20 hindcast starts of seasonal reduced']),
    );
  });

  it('on a terminal: one bar rewritten in place (carriage return), a newline only when done', () => {
    const out = stream(true);
    const report = progressReporter('skill', run, out);
    report(1, 4, 'calibrated short');
    expect(out.text).toBe(`\r${'skill [######------------------] 1/4 calibrated short'.padEnd(60)}`);
    report(4, 4, 'done');
    expect(out.text.endsWith(`\r${'skill [########################] 4/4 done'.padEnd(60)}\n`)).toBe(true);
  });
});
