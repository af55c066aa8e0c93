/**
 * Several configurations issued at once (`forelight run --config A --config B …`, the service's configurations due
 * at the same slot): each is its own run, with its own ledger, outbox, archive, lock and status file, but their
 * reads go through one `shareReads`, so a file they all use is read once over the union of their regions.
 */
import type { Config } from '../config/types.ts';
import { ForelightError } from '../core/errors.ts';
import { EXIT, type ExitCode } from '../core/exit-codes.ts';
import { computeNextRuns } from '../core/next-runs.ts';
import { extractRegionSeries, type Extractor } from '../read/extract.ts';
import type { Readers } from './analyse.ts';
import { shareReads, type SharedReads } from './shared-reads.ts';

/** Which exit code stands for several runs: the most serious one (an unexpected error first, all issued last). */
const SERIOUSNESS: readonly ExitCode[] = [
  EXIT.unexpected,
  EXIT.contradiction,
  EXIT.deliveryFailed,
  EXIT.inputProblem,
  EXIT.locked,
  EXIT.stopped,
  EXIT.nothingNew,
  EXIT.ok,
];

export function combinedExitCode(codes: readonly ExitCode[]): ExitCode {
  return SERIOUSNESS.find((c) => codes.includes(c)) ?? codes[0] ?? EXIT.ok;
}

/** Two configurations writing the same ledger, outbox or archive would mix their runs: refused, naming both files. */
export function checkSeparateOutputs(configs: readonly Config[]): void {
  const outputs = (c: Config): [string, string][] => [
    ['ledger', c.ledger],
    ['outbox', c.delivery.outbox],
    ['archive', c.delivery.archive],
  ];
  for (const [i, a] of configs.entries())
    for (const b of configs.slice(i + 1))
      for (const [key, path] of outputs(a)) {
        if (outputs(b).some(([k, p]) => k === key && p === path))
          throw new ForelightError(
            'cli',
            'usage',
            `${a.file} and ${b.file} both write the ${key} ${path}`,
            `give each configuration issued together its own ${key}`,
          );
      }
}

/**
 * Issues every configuration concurrently through `issue`, their reads shared (through `readers.extract`, default
 * this process); results in configuration order. A configuration that throws does not stop the others.
 */
export async function runSeveral<R>(
  configs: readonly Config[],
  readers: Readers,
  issue: (config: Config, readers: Readers, index: number) => Promise<R>,
): Promise<PromiseSettledResult<R>[]> {
  checkSeparateOutputs(configs);
  const shared = shareReads(configs, readers.extract ?? extractRegionSeries);
  return Promise.allSettled(
    configs.map(async (config, i) => {
      try {
        return await issue(config, { ...readers, extract: shared.forConfig(i) }, i);
      } finally {
        shared.finished(i);
      }
    }),
  );
}

/**
 * The service's form: configurations each on their own schedule; those due at the same slot share their reads
 * (one `shareReads` per slot, over the configurations whose schedule has that slot). A slot's reads are released
 * when each of its configurations finished it, or when the next slot begins (one whose run was skipped, e.g.
 * because another process held its lock, never takes them).
 */
export function slotReads(configs: readonly Config[], extract: Extractor = extractRegionSeries) {
  let current: { slot: string; shared: SharedReads } | null = null;
  const dueAt = (config: Config, slot: Date): boolean =>
    computeNextRuns(config.schedule.cron, config.schedule.timezone, new Date(slot.getTime() - 1), 1)[0]?.getTime() === slot.getTime();
  return (index: number, slot: Date): { extract: Extractor; finished: () => void } => {
    const key = slot.toISOString();
    if (current?.slot !== key) {
      if (current) configs.forEach((_, i) => current?.shared.finished(i));
      const shared = shareReads(configs, extract);
      configs.forEach((c, i) => i !== index && !dueAt(c, slot) && shared.finished(i));
      current = { slot: key, shared };
    }
    const { shared } = current;
    return { extract: shared.forConfig(index), finished: () => shared.finished(index) };
  };
}
