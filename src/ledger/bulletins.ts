/**
 * Rendered bulletins, stored with their attachments BEFORE any sending, each with one `deliveries` row per
 * recipient. Storing is idempotent per run × bulletin id: a resumed run keeps what it rendered first.
 */
import { createHash } from 'node:crypto';
import { ForelightError } from '../core/errors.ts';
import type { Bulletin } from '../bulletin-types.ts';
import { stamp, type Ledger } from './open-ledger.ts';
import { idRows, returnedId, rowReader } from './rows.ts';

export interface StoredBulletin extends Bulletin {
  /** Ledger row id (unique across runs, unlike `id`). */
  readonly rowId: number;
  readonly runId: number;
  readonly forecastKey: string;
  readonly contentSha256: string;
  readonly createdAt: string;
}

/** SHA-256 over subject, html, text and every attachment (cid, type, bytes), NUL-separated. */
export function bulletinContentHash(b: Bulletin): string {
  const h = createHash('sha256');
  for (const part of [b.subject, b.html, b.text]) h.update(part).update('\0');
  for (const a of b.attachments) h.update(a.cid).update('\0').update(a.contentType).update('\0').update(a.content).update('\0');
  return h.digest('hex');
}

/** Normalised, de-duplicated recipient list (trimmed; case-insensitive duplicates dropped). */
function uniqueRecipients(to: readonly string[]): string[] {
  const seen = new Map<string, string>();
  for (const raw of to) {
    const addr = raw.trim();
    if (addr && !seen.has(addr.toLowerCase())) seen.set(addr.toLowerCase(), addr);
  }
  return [...seen.values()];
}

/** Store bulletins and their pending deliveries in one transaction; returns the ledger row ids. */
export function recordBulletins(ledger: Ledger, runId: number, bulletins: readonly Bulletin[]): number[] {
  const { db } = ledger;
  const find = db.prepare('SELECT id FROM bulletins WHERE run_id = ? AND bulletin_key = ?');
  const insert = db.prepare(`INSERT INTO bulletins (run_id, bulletin_key, team, locale, subject, html, text, content_sha256, created_at)
    VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id`);
  const insertAttachment = db.prepare(`INSERT INTO attachments (bulletin_id, position, cid, filename, content_type, content)
    VALUES (?, ?, ?, ?, ?, ?)`);
  const insertDelivery = db.prepare(`INSERT INTO deliveries (bulletin_id, recipient, status, created_at, updated_at)
    VALUES (?, ?, 'pending', ?, ?)`);
  return db
    .transaction(() => {
      const now = stamp(ledger);
      return bulletins.map((b) => {
        const existing = idRows.one(find.get(runId, b.id), ledger.path);
        if (existing) return existing.id;
        const inserted = insert.get(runId, b.id, b.team, b.locale, b.subject, b.html, b.text, bulletinContentHash(b), now);
        const rowId = returnedId('bulletins', inserted, ledger.path);
        b.attachments.forEach((a, i) => insertAttachment.run(rowId, i, a.cid, a.filename, a.contentType, Buffer.from(a.content)));
        for (const recipient of uniqueRecipients(b.to)) insertDelivery.run(rowId, recipient, now, now);
        return rowId;
      });
    })
    .immediate();
}

export function hasBulletins(ledger: Ledger, runId: number): boolean {
  return ledger.db.prepare('SELECT 1 FROM bulletins WHERE run_id = ? LIMIT 1').get(runId) !== undefined;
}

const BULLETIN_COLUMNS = {
  id: 'integer',
  run_id: 'integer',
  forecast_key: 'text',
  bulletin_key: 'text',
  team: 'text',
  locale: 'text',
  subject: 'text',
  content_sha256: 'text',
  created_at: 'text',
} as const;
const bulletinRows = rowReader('bulletins', { ...BULLETIN_COLUMNS, html: 'text', text: 'text' });
const issuedRows = rowReader('issued bulletins', { ...BULLETIN_COLUMNS, forced: 'integer' });
const attachmentRows = rowReader('attachments', { cid: 'text', filename: 'text', content_type: 'text', content: 'blob' });
const recipientRows = rowReader('deliveries recipient', { recipient: 'text' });
const statusCountRows = rowReader('delivery counts', { bulletin_id: 'integer', status: 'text', n: 'integer' });

export function readBulletin(ledger: Ledger, rowId: number): StoredBulletin {
  const row = bulletinRows.one(
    ledger.db.prepare(`SELECT b.*, r.forecast_key FROM bulletins b JOIN runs r ON r.id = b.run_id WHERE b.id = ?`).get(rowId),
    ledger.path,
  );
  if (!row)
    throw new ForelightError(
      'ledger',
      'bulletin-unknown',
      `bulletin row ${rowId} is not in ledger ${ledger.path}`,
      'list bulletins with issuedBulletins()',
    );
  const attachments = attachmentRows
    .all(
      ledger.db.prepare('SELECT cid, filename, content_type, content FROM attachments WHERE bulletin_id = ? ORDER BY position').all(rowId),
      ledger.path,
    )
    .map((a) => ({ cid: a.cid, filename: a.filename, contentType: a.content_type, content: new Uint8Array(a.content) }));
  const to = recipientRows
    .all(ledger.db.prepare('SELECT recipient FROM deliveries WHERE bulletin_id = ? ORDER BY id').all(rowId), ledger.path)
    .map((r) => r.recipient);
  return {
    rowId: row.id,
    runId: row.run_id,
    forecastKey: row.forecast_key,
    id: row.bulletin_key,
    team: row.team,
    locale: row.locale,
    to,
    subject: row.subject,
    html: row.html,
    text: row.text,
    attachments,
    contentSha256: row.content_sha256,
    createdAt: row.created_at,
  };
}

export interface IssuedBulletin {
  readonly rowId: number;
  readonly runId: number;
  readonly forecastKey: string;
  readonly forced: boolean;
  readonly bulletinId: string;
  readonly team: string;
  readonly locale: string;
  readonly subject: string;
  readonly contentSha256: string;
  readonly createdAt: string;
  /** Delivery count per status, e.g. { sent: 3, failed: 1 }. */
  readonly deliveries: Readonly<Record<string, number>>;
}

/** Every bulletin of every issued run (ok or partial), newest first: the listing for the HTML archive. */
export function issuedBulletins(ledger: Ledger): IssuedBulletin[] {
  const issued = `FROM bulletins b JOIN runs r ON r.id = b.run_id WHERE r.status IN ('ok', 'partial')`;
  const rows = issuedRows.all(
    ledger.db
      .prepare(
        `SELECT b.id, b.run_id, r.forecast_key, r.forced, b.bulletin_key, b.team, b.locale, b.subject,
      b.content_sha256, b.created_at ${issued} ORDER BY r.forecast_key DESC, b.run_id DESC, b.id`,
      )
      .all(),
    ledger.path,
  );
  const counts = new Map<number, Record<string, number>>();
  const countSql = `SELECT d.bulletin_id, d.status, count(*) AS n FROM deliveries d
      WHERE d.bulletin_id IN (SELECT b.id ${issued}) GROUP BY d.bulletin_id, d.status`;
  for (const c of statusCountRows.all(ledger.db.prepare(countSql).all(), ledger.path)) {
    counts.set(c.bulletin_id, { ...counts.get(c.bulletin_id), [c.status]: c.n });
  }
  return rows.map((r) => ({
    rowId: r.id,
    runId: r.run_id,
    forecastKey: r.forecast_key,
    forced: r.forced === 1,
    bulletinId: r.bulletin_key,
    team: r.team,
    locale: r.locale,
    subject: r.subject,
    contentSha256: r.content_sha256,
    createdAt: r.created_at,
    deliveries: counts.get(r.id) ?? {},
  }));
}
