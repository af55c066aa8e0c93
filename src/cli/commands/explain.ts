/** `forelight explain --region R --indicator I --tier T`: the chain from inputs to stage, with the numbers. */
import { explainDecision } from '../../decide/explain.ts';
import { decideNow } from '../../pipeline/decide-now.ts';
import { pairKey, trackKey } from '../../core/keys.ts';
import { percentileLinear } from '../../core/percentile.ts';
import type { LeadValues } from '../../calibrate/lead-tiers.ts';
import type { EnsembleSummary } from '../../decide/explain.ts';
import { formatDiagnostic } from '../../core/diagnostics.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { TIERS } from '../../types.ts';
import { stringOption, usageError, type ParsedArgs } from '../args.ts';
import { commandContext } from '../context.ts';

/** Minimum, median and maximum over members per lead index. */
function ensembleSummaries(leads: LeadValues, units: string): Map<number, EnsembleSummary> {
  const n = leads.leads.length;
  return new Map(
    leads.leads.map((lead, l) => {
      const v = Array.from({ length: leads.members }, (_, m) => leads.values[m * n + l]).filter((x) => !Number.isNaN(x));
      return [lead.index, { min: Math.min(...v), median: percentileLinear(v, 50), max: Math.max(...v), units }];
    }),
  );
}

export async function explainCommand(args: ParsedArgs): Promise<number> {
  const { config, run } = await commandContext(args, 'explain');
  const { issueDate } = run;
  const region = stringOption(args, 'region');
  const indicator = stringOption(args, 'indicator');
  const tierOption = stringOption(args, 'tier');
  const tier = TIERS.find((t) => t === tierOption);
  if (!region || !config.regions.some((r) => r.id === region))
    throw usageError(`--region must be one of ${config.regions.map((r) => r.id).join(', ')}`);
  if (!indicator || !config.indicators.some((i) => i.id === indicator))
    throw usageError(`--indicator must be one of ${config.indicators.map((i) => i.id).join(', ')}`);
  if (!tier) throw usageError(`--tier must be one of ${TIERS.join(', ')}`);
  const { analysis, decided, history } = await decideNow(config, run);
  const decision = decided.decisions.find((d) => d.region === region && d.indicator === indicator && d.tier === tier);
  if (!decision) {
    process.stdout.write(
      `no decision for ${region} × ${indicator} × ${tier} on ${issueDate}: no source of tier ${tier} computes this indicator, or its data were skipped\n`,
    );
    for (const p of analysis.problems) process.stdout.write(`  skipped: ${formatDiagnostic(p)}\n`);
    return EXIT.inputProblem;
  }
  const used =
    decision.lead?.source ??
    analysis.probabilities.find((p) => p.region === region && p.indicator === indicator && p.lead.tier === tier)?.source;
  const leads = analysis.sources.find((s) => s.source === used)?.forecastLeads.get(pairKey(region, indicator));
  const units = analysis.probabilities.find((p) => p.region === region && p.indicator === indicator)?.threshold.units ?? '';
  const lines = explainDecision({
    config,
    decision,
    probabilities: analysis.probabilities,
    previous: history.tracks[trackKey(region, indicator, tier)],
    values: leads ? ensembleSummaries(leads, units) : undefined,
  });
  process.stdout.write(lines.join('\n') + '\n');
  return EXIT.ok;
}
