/**
 * What `forelight run --dry-run` prints: what the run would issue (region stages and their changes against the last
 * issued bulletin, bulletins, recipients, archive, operator notices) and any contradiction found in what it rendered.
 */
import type { Config } from '../config/types.ts';
import { formatDiagnostic } from '../core/diagnostics.ts';
import { stageChangeLines } from '../decide/diff.ts';
import type { DeliveryRecord } from '../ledger/deliveries.ts';
import type { IsoDate } from '../types.ts';
import type { Prepared } from './prepare-run.ts';

export interface DryRunFacts {
  readonly config: Pick<Config, 'regions' | 'stages' | 'delivery'>;
  readonly issueDate: IsoDate;
  readonly key: string;
  /** Null when the run resumes an interrupted one whose bulletins were already stored. */
  readonly prepared: Prepared | null;
  /** Deliveries the run would make (rows of the in-memory ledger copy). */
  readonly pending: readonly DeliveryRecord[];
  /** Subjects of the operator notices a real run would send. */
  readonly wouldNotify: readonly string[];
}

export function dryRunReport(facts: DryRunFacts): string {
  const { prepared, config } = facts;
  const channel = config.delivery.smtp ? 'by e-mail' : `to the outbox ${config.delivery.outbox}`;
  const lines = [`dry run for ${facts.issueDate} (nothing stored, archived or sent): would issue ${facts.key}`];
  if (prepared) {
    const since = prepared.previous.length === 0 ? ' (no bulletin issued yet)' : ' (against the last issued bulletin)';
    lines.push(`region stages${since}:`, ...stageChangeLines(config, prepared.regionStages, prepared.changes));
    lines.push(`${prepared.bulletins} bulletin(s); archive entry under ${config.delivery.archive}`);
    for (const d of prepared.contradictions) lines.push(`  contradiction: ${formatDiagnostic(d)}`);
  } else {
    lines.push('resumes an interrupted run whose bulletins are already stored');
  }
  const recipients = [...new Set(facts.pending.map((d) => d.recipient))].sort();
  lines.push(`${facts.pending.length} message(s) ${channel}${recipients.length > 0 ? `: ${recipients.join(', ')}` : ''}`);
  for (const subject of facts.wouldNotify) lines.push(`operator notice: ${subject}`);
  return lines.join('\n');
}
