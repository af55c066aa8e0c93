/**
 * Analysis + decision against the ledger's history WITHOUT writing anything: what `diff`, `explain` and
 * `run --dry-run` show is exactly what a run on the same inputs would issue.
 */
import { missingData } from './missing-data.ts';
import type { Config } from '../config/types.ts';
import { decideStages, type DecideResult } from '../decide/decide-stages.ts';
import { parseStageHistory } from '../decide/history.ts';
import type { RegionStageLike } from '../decide/diff.ts';
import { pairOf, tunedKey, type TunedKey } from '../core/keys.ts';
import type { StageHistory } from '../decide/types.ts';
import { ledgerMayHoldRuns, openConfiguredLedger } from '../ledger/ledger-target.ts';
import { lastIssuedStages, latestStageHistory } from '../ledger/results.ts';
import type { RunContext } from '../core/run-context.ts';
import { analyse, type AnalyseOptions, type Analysis } from './analyse.ts';
import { issuedRegionStages } from './bulletin-run.ts';

export interface DecidedNow {
  readonly analysis: Analysis;
  readonly decided: DecideResult;
  readonly history: StageHistory;
  /** Region stages of the last issued bulletin. */
  readonly previous: readonly RegionStageLike[];
}

/**
 * Tuned cost/loss thresholds of every region × rule (`tunedKey`), from the analysis' climates: the member-count-free
 * probability of each trigger (calibrate/trigger-tuning.ts), so a forecast with more members than the hindcasts is
 * held to the same trigger. When two sources of one tier both tune a rule for a region, the first source in the
 * configuration's order gives it.
 */
export function tunedThresholds(analysis: Analysis): Map<TunedKey, number> {
  const out = new Map<TunedKey, number>();
  for (const s of analysis.sources) {
    for (const [key, c] of s.climates) {
      const { region } = pairOf(key);
      for (const [rule, t] of Object.entries(c.tuned))
        if (!out.has(tunedKey(region, rule))) out.set(tunedKey(region, rule), t.forecastThreshold);
    }
  }
  return out;
}

/** The stages of an analysis given the stage history: its probabilities, tuned triggers and missing parts decided. */
export function decideAnalysis(config: Config, analysis: Analysis, history: StageHistory): DecideResult {
  return decideStages({
    config,
    probabilities: analysis.probabilities,
    history,
    thresholdsFromCostLoss: tunedThresholds(analysis),
    ...missingData(config, analysis),
  });
}

export async function decideNow(
  config: Config,
  run: RunContext,
  options: Pick<AnalyseOptions, 'onProgress' | 'onStartReduced'> = {},
): Promise<DecidedNow> {
  let historyJson: string | null = null;
  let previous: RegionStageLike[] = [];
  if (ledgerMayHoldRuns(config)) {
    const ledger = openConfiguredLedger(config);
    try {
      historyJson = latestStageHistory(ledger);
      previous = issuedRegionStages(config, lastIssuedStages(ledger));
    } finally {
      ledger.close();
    }
  }
  const history = parseStageHistory(historyJson);
  const analysis = await analyse(config, run, options);
  return { analysis, decided: decideAnalysis(config, analysis, history), history, previous };
}
