/** `forelight status`: last run, its result, next run and failures, from the service status file and the ledger. */
import { loadConfig } from '../../config/load-config.ts';
import { listDeliveries } from '../../ledger/deliveries.ts';
import { ledgerMayHoldRuns, openConfiguredLedger } from '../../ledger/ledger-target.ts';
import { servicePaths } from '../../schedule/run-service.ts';
import { clusterStatus, formatClusterStatus } from '../../cluster/cluster-status.ts';
import { runDiagnostics } from '../../ledger/diagnostics.ts';
import { lastCompletedRun } from '../../ledger/runs.ts';
import { formatDiagnostic, isBulletinContradiction } from '../../core/diagnostics.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { computeNextRuns } from '../../core/next-runs.ts';
import { describeService, readStatus } from '../../schedule/status-file.ts';
import { isProcessAlive } from '../../core/process-alive.ts';
import { stringOption, type ParsedArgs } from '../args.ts';

export async function statusCommand(args: ParsedArgs): Promise<number> {
  const config = await loadConfig(stringOption(args, 'config'));
  const lines: string[] = [];
  const service = readStatus(servicePaths(config).statusPath);
  const [next] = computeNextRuns(config.schedule.cron, config.schedule.timezone, new Date(), 1);
  lines.push(`next scheduled run: ${next?.toISOString() ?? 'none'} (${config.schedule.cron}, ${config.schedule.timezone})`);
  lines.push(`service: ${describeService(service, isProcessAlive)}`);
  if (service?.lastRun)
    lines.push(
      `last run: ${service.lastRun.reason} ${service.lastRun.startedAt} → ${service.lastRun.exitName} (exit ${service.lastRun.exitCode}): ${service.lastRun.summary}`,
    );
  if (service && service.consecutiveFailures > 0) lines.push(`failed runs in a row: ${service.consecutiveFailures}`);
  if (!ledgerMayHoldRuns(config)) {
    lines.push(`ledger ${config.ledger}: no runs yet`);
  } else {
    const ledger = openConfiguredLedger(config);
    try {
      const last = lastCompletedRun(ledger);
      lines.push(
        last
          ? `last completed run: ${last.id} (${last.forecastKey}) ${last.status} at ${last.finishedAt}${last.error ? ` — ${last.error}` : ''}`
          : 'last completed run: none',
      );
      const found = last ? runDiagnostics(ledger, last.id) : [];
      const contradictions = found.filter(isBulletinContradiction);
      const problems = found.filter((d) => !isBulletinContradiction(d));
      if (contradictions.length > 0)
        lines.push(`bulletin contradictions of run ${last?.id} (a bug in Forelight, report it with run.json): ${contradictions.length}`);
      for (const d of contradictions.slice(0, 20)) lines.push(`  ${formatDiagnostic(d)}`);
      if (problems.length > 0) lines.push(`input problems of run ${last?.id}: ${problems.length}`);
      for (const d of problems.slice(0, 20)) lines.push(`  ${formatDiagnostic(d)}`);
      const open = listDeliveries(ledger, { statuses: ['pending', 'sending', 'failed'] });
      lines.push(`deliveries pending or failed: ${open.length}`);
      for (const d of open.slice(0, 20)) lines.push(`  ${d.status} ${d.recipient}: ${d.lastError ?? ''}`);
    } finally {
      ledger.close();
    }
  }
  const cluster = stringOption(args, 'cluster');
  if (cluster) lines.push(...formatClusterStatus(await clusterStatus(cluster)));
  process.stdout.write(lines.join('\n') + '\n');
  return EXIT.ok;
}
