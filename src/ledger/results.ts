/**
 * What a run computed and decided: exceedance probabilities, stage decisions, the persistence state the
 * decide stage carries from run to run, and the CAP alert identifiers issued (for CAP `references`).
 */
import { TIERS, type Tier } from '../types.ts';
import type { StageDecision } from '../decision-types.ts';
import type { LeadProbability } from '../probability-types.ts';
import { ForelightError, describeError } from '../core/errors.ts';
import { stamp, type Ledger } from './open-ledger.ts';
import { rowReader } from './rows.ts';
import { upsertSql } from './sql-db.ts';

/** Runs whose results count as issued advice. */
const ISSUED = `status IN ('ok', 'partial')`;

export function recordProbabilities(ledger: Ledger, runId: number, probabilities: readonly LeadProbability[]): void {
  const insert = ledger.db.prepare(
    upsertSql(
      'probabilities',
      [
        'run_id',
        'source',
        'region',
        'indicator',
        'tier',
        'lead_index',
        'lead_start',
        'lead_end',
        'probability',
        'base_rate',
        'members',
        'valid_members',
        'threshold_value',
        'threshold_units',
        'threshold_origin',
        'calibrated',
        'flags_json',
        'skill_json',
      ],
      ['run_id', 'source', 'region', 'indicator', 'tier', 'lead_index'],
    ),
  );
  ledger.db.transaction(() => {
    for (const p of probabilities) {
      insert.run(
        runId,
        p.source,
        p.region,
        p.indicator,
        p.lead.tier,
        p.lead.index,
        p.lead.start,
        p.lead.end,
        finiteOrNull(p.probability),
        finiteOrNull(p.baseRate),
        p.members,
        p.validMembers,
        finiteOrNull(p.threshold.value),
        p.threshold.units,
        p.threshold.origin,
        p.calibrated ? 1 : 0,
        JSON.stringify(p.flags),
        p.skill ? JSON.stringify(p.skill) : null,
      );
    }
  })();
}

/** SQLite stores NaN as NULL anyway; say so explicitly. */
const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

export function recordDecisions(ledger: Ledger, runId: number, decisions: readonly StageDecision[]): void {
  const insert = ledger.db.prepare(
    upsertSql(
      'decisions',
      ['run_id', 'region', 'indicator', 'tier', 'stage_id', 'raw_stage_id', 'rule_id', 'reasons_json'],
      ['run_id', 'region', 'indicator', 'tier'],
    ),
  );
  ledger.db.transaction(() => {
    for (const d of decisions) {
      insert.run(runId, d.region, d.indicator, d.tier, d.stageId, d.rawStageId, d.ruleId, JSON.stringify(d.reasons));
    }
  })();
}

export interface IssuedStage {
  readonly runId: number;
  readonly forecastKey: string;
  readonly region: string;
  readonly indicator: string;
  readonly tier: Tier;
  readonly stageId: string;
}

const issuedStageRows = rowReader('decisions', {
  run_id: 'integer',
  forecast_key: 'text',
  region: 'text',
  indicator: 'text',
  tier: TIERS,
  stage_id: 'text',
});
const historyRows = rowReader('stage_history', { state_json: 'text' });
const capRows = rowReader('cap_alerts', { identifier: 'text', sender: 'text', sent: 'text', msg_type: ['Alert', 'Update', 'Cancel'] });

/** Stages of the latest issued run (ok or partial), one per region × indicator × tier. */
export function lastIssuedStages(ledger: Ledger): IssuedStage[] {
  const rows = ledger.db
    .prepare(
      `SELECT d.run_id, r.forecast_key, d.region, d.indicator, d.tier, d.stage_id
    FROM decisions d JOIN runs r ON r.id = d.run_id
    WHERE d.run_id = (SELECT id FROM runs WHERE ${ISSUED} AND id IN (SELECT run_id FROM decisions) ORDER BY id DESC LIMIT 1)
    ORDER BY d.region, d.indicator, d.tier`,
    )
    .all();
  return issuedStageRows.all(rows, ledger.path).map((r) => ({
    runId: r.run_id,
    forecastKey: r.forecast_key,
    region: r.region,
    indicator: r.indicator,
    tier: r.tier,
    stageId: r.stage_id,
  }));
}

/** Store the decide stage's persistence state (opaque JSON, shape owned by src/decide). */
export function saveStageHistory(ledger: Ledger, runId: number, json: string): void {
  try {
    JSON.parse(json);
  } catch (err) {
    throw new ForelightError(
      'ledger',
      'stage-history-json',
      `stage history of run ${runId} is not JSON: ${describeError(err)}`,
      'pass the JSON.stringify-ed state of the decide stage',
    );
  }
  ledger.db.prepare(upsertSql('stage_history', ['run_id', 'state_json', 'saved_at'], ['run_id'])).run(runId, json, stamp(ledger));
}

/**
 * Persistence state of the latest issued run other than `excludeRunId` (pass the current run id so a
 * resumed run starts from the same history it started from the first time). Null on a fresh ledger.
 */
export function latestStageHistory(ledger: Ledger, excludeRunId?: number): string | null {
  const sql = `SELECT h.state_json FROM stage_history h JOIN runs r ON r.id = h.run_id
    WHERE r.${ISSUED} AND h.run_id <> ? ORDER BY h.run_id DESC LIMIT 1`;
  const row = historyRows.one(ledger.db.prepare(sql).get(excludeRunId ?? -1), ledger.path);
  return row ? row.state_json : null;
}

export interface CapAlertRecord {
  readonly identifier: string;
  readonly sender: string;
  /** CAP `sent` timestamp as written in the alert. */
  readonly sent: string;
  readonly msgType: 'Alert' | 'Update' | 'Cancel';
}

export function recordCapAlert(ledger: Ledger, runId: number, region: string, indicator: string, alert: CapAlertRecord): void {
  ledger.db
    .prepare(upsertSql('cap_alerts', ['identifier', 'run_id', 'region', 'indicator', 'sender', 'sent', 'msg_type'], ['identifier']))
    .run(alert.identifier, runId, region, indicator, alert.sender, alert.sent, alert.msgType);
}

/** The latest CAP alert issued for region × indicator by an issued run other than `excludeRunId`. */
export function previousCapAlert(ledger: Ledger, region: string, indicator: string, excludeRunId?: number): CapAlertRecord | null {
  const sql = `SELECT c.identifier, c.sender, c.sent, c.msg_type FROM cap_alerts c JOIN runs r ON r.id = c.run_id
    WHERE c.region = ? AND c.indicator = ? AND r.${ISSUED} AND c.run_id <> ? ORDER BY c.run_id DESC, c.sent DESC LIMIT 1`;
  const row = capRows.one(ledger.db.prepare(sql).get(region, indicator, excludeRunId ?? -1), ledger.path);
  return row ? { identifier: row.identifier, sender: row.sender, sent: row.sent, msgType: row.msg_type } : null;
}
