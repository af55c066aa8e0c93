/**
 * Per-recipient delivery rows: pending → sending (claimed, attempts+1) → sent | outbox | failed, or back to
 * pending when nothing could be tried (outbox not writable, password missing). `superseded` = a newer run
 * made it stale. Every transition is one UPDATE guarded by the expected current status (atomic claim).
 */
import { ForelightError } from '../core/errors.ts';
import type { DeliveryReceipt } from '../bulletin-types.ts';
import { stamp, type Ledger } from './open-ledger.ts';
import { rowReader, type RowType } from './rows.ts';

const DELIVERY_STATUSES = ['pending', 'sending', 'sent', 'outbox', 'failed', 'superseded'] as const;
export type DeliveryStatus = (typeof DELIVERY_STATUSES)[number];

export interface DeliveryRecord {
  readonly id: number;
  readonly bulletinRowId: number;
  readonly runId: number;
  readonly forecastKey: string;
  readonly recipient: string;
  readonly status: DeliveryStatus;
  readonly attempts: number;
  readonly lastError: string | null;
  readonly messageId: string | null;
  /** `host:pid:token` of the claimer while status is `sending`. */
  readonly claimedBy: string | null;
  readonly claimedAt: string | null;
  readonly outboxPath: string | null;
  /** `due` until the operators have been told of this failure, then `done`. */
  readonly notice: 'due' | 'done' | null;
  readonly updatedAt: string;
}

const DELIVERY_COLUMNS = {
  id: 'integer',
  bulletin_id: 'integer',
  run_id: 'integer',
  forecast_key: 'text',
  recipient: 'text',
  status: DELIVERY_STATUSES,
  attempts: 'integer',
  last_error: 'text?',
  message_id: 'text?',
  claimed_by: 'text?',
  claimed_at: 'text?',
  outbox_path: 'text?',
  notice: ['due', 'done', null],
  updated_at: 'text',
} as const;
const deliveryRows = rowReader('deliveries', DELIVERY_COLUMNS);
const noticeRows = rowReader('deliveries with team', { ...DELIVERY_COLUMNS, team: 'text' });
const countRows = rowReader('delivery counts', { status: DELIVERY_STATUSES, n: 'integer' });
type DeliveryRow = RowType<typeof deliveryRows>;

const SELECT = `SELECT d.*, b.run_id, r.forecast_key FROM deliveries d
  JOIN bulletins b ON b.id = d.bulletin_id JOIN runs r ON r.id = b.run_id`;

const toRecord = (r: DeliveryRow): DeliveryRecord => ({
  id: r.id,
  bulletinRowId: r.bulletin_id,
  runId: r.run_id,
  forecastKey: r.forecast_key,
  recipient: r.recipient,
  status: r.status,
  attempts: r.attempts,
  lastError: r.last_error,
  messageId: r.message_id,
  claimedBy: r.claimed_by,
  claimedAt: r.claimed_at,
  outboxPath: r.outbox_path,
  notice: r.notice,
  updatedAt: r.updated_at,
});

/** Deliveries in the given statuses (default: pending), optionally of one run, oldest first. */
export function listDeliveries(ledger: Ledger, options: { statuses?: readonly DeliveryStatus[]; runId?: number } = {}): DeliveryRecord[] {
  const statuses = options.statuses ?? ['pending'];
  const rows = ledger.db
    .prepare(
      `${SELECT} WHERE d.status IN (${statuses.map(() => '?').join(', ')})
    ${options.runId === undefined ? '' : 'AND b.run_id = ?'} ORDER BY d.id`,
    )
    .all(...statuses, ...(options.runId === undefined ? [] : [options.runId]));
  return deliveryRows.all(rows, ledger.path).map(toRecord);
}

export function pendingDeliveries(ledger: Ledger, runId?: number): DeliveryRecord[] {
  return listDeliveries(ledger, { statuses: ['pending'], runId });
}

/**
 * Claim a pending delivery for sending: status → sending, attempts + 1, Message-ID fixed on first claim
 * (kept on later claims so a re-send carries the same Message-ID). Returns null when someone else holds it.
 */
export function claimDelivery(ledger: Ledger, id: number, claimedBy: string, messageId: string): DeliveryRecord | null {
  const now = stamp(ledger);
  const changed = ledger.db
    .prepare(
      `UPDATE deliveries SET status = 'sending', attempts = attempts + 1, claimed_by = ?,
    claimed_at = ?, updated_at = ?, message_id = coalesce(message_id, ?) WHERE id = ? AND status = 'pending'`,
    )
    .run(claimedBy, now, now, messageId, id).changes;
  return changed === 1 ? getDelivery(ledger, id) : null;
}

export function getDelivery(ledger: Ledger, id: number): DeliveryRecord {
  const row = deliveryRows.one(ledger.db.prepare(`${SELECT} WHERE d.id = ?`).get(id), ledger.path);
  if (!row)
    throw new ForelightError(
      'ledger',
      'ledger-row',
      `delivery ${id} is not in ledger ${ledger.path}`,
      'list deliveries with "forelight status"',
    );
  return toRecord(row);
}

/**
 * Record the outcome of a claimed delivery (only while it is `sending`, so a late writer cannot overwrite a
 * newer state). `pending` releases the claim for a later run. `noticeDue` marks a failure the operators must
 * be told of (kept in the ledger so a crash before the notice does not lose it). False when not `sending`.
 */
export function markDelivery(
  ledger: Ledger,
  id: number,
  status: 'sent' | 'outbox' | 'failed' | 'pending',
  detail: { error?: string; outboxPath?: string; noticeDue?: boolean } = {},
): boolean {
  return (
    ledger.db
      .prepare(
        `UPDATE deliveries SET status = ?, last_error = coalesce(?, last_error),
    outbox_path = coalesce(?, outbox_path), notice = CASE WHEN ? = 1 THEN 'due' ELSE notice END,
    claimed_by = NULL, claimed_at = NULL, updated_at = ?
    WHERE id = ? AND status = 'sending'`,
      )
      .run(status, detail.error ?? null, detail.outboxPath ?? null, detail.noticeDue ? 1 : 0, stamp(ledger), id).changes === 1
  );
}

/** Failures the operators have not been told of yet, oldest first. */
export function dueNotices(ledger: Ledger): (DeliveryRecord & { team: string })[] {
  const rows = ledger.db
    .prepare(
      `SELECT d.*, b.run_id, b.team, r.forecast_key FROM deliveries d
    JOIN bulletins b ON b.id = d.bulletin_id JOIN runs r ON r.id = b.run_id WHERE d.notice = 'due' ORDER BY d.id`,
    )
    .all();
  return noticeRows.all(rows, ledger.path).map((r) => ({ ...toRecord(r), team: r.team }));
}

export function markNoticesDone(ledger: Ledger, ids: readonly number[]): void {
  const update = ledger.db.prepare(`UPDATE deliveries SET notice = 'done' WHERE id = ? AND notice = 'due'`);
  ledger.db.transaction(() => {
    for (const id of ids) update.run(id);
  })();
}

export function deliveryCounts(ledger: Ledger, runId: number): Record<DeliveryStatus, number> {
  const counts: Record<DeliveryStatus, number> = { pending: 0, sending: 0, sent: 0, outbox: 0, failed: 0, superseded: 0 };
  const sql = `SELECT d.status, count(*) AS n FROM deliveries d JOIN bulletins b ON b.id = d.bulletin_id
    WHERE b.run_id = ? GROUP BY d.status`;
  for (const r of countRows.all(ledger.db.prepare(sql).all(runId), ledger.path)) counts[r.status] = r.n;
  return counts;
}

/** Receipt for a delivery in a final state (sent → Message-ID, outbox → file, failed → last error). */
export function toReceipt(d: DeliveryRecord & { status: 'sent' | 'outbox' | 'failed' }, bulletinId: string): DeliveryReceipt {
  const detail = d.status === 'sent' ? d.messageId : d.status === 'outbox' ? (d.outboxPath ?? d.lastError) : (d.lastError ?? d.outboxPath);
  return { bulletinId, recipient: d.recipient, status: d.status, detail: detail ?? '', at: d.updatedAt };
}

/** Put a `sending` row whose claimer is gone back to pending (only if `claimedBy` still holds it). */
export function releaseClaim(ledger: Ledger, id: number, claimedBy: string, note: string): boolean {
  return (
    ledger.db
      .prepare(
        `UPDATE deliveries SET status = 'pending', claimed_by = NULL, claimed_at = NULL, updated_at = ?,
    last_error = ? WHERE id = ? AND status = 'sending' AND claimed_by = ?`,
      )
      .run(stamp(ledger), note, id, claimedBy).changes === 1
  );
}
