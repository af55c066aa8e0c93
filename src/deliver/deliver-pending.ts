/**
 * Deliver every pending bulletin × recipient recorded in the ledger, one message per recipient (so one
 * rejected address never blocks the others, and each recipient has its own status and Message-ID).
 *
 * At-least-once, never lost. Each delivery is claimed (pending → sending, with its Message-ID, committed) before
 * the SMTP transaction and marked sent right after the server's 250 reply. A crash before the claim or after the
 * mark loses and duplicates nothing. The residual window runs from the end of DATA (the final "." sent) to the
 * `sent` commit: it covers the server's own processing before it replies (a slow or overloaded server widens it,
 * up to delivery.smtp.timeout-seconds) plus a few milliseconds of SQLite work. A process killed inside it leaves
 * the row `sending`; the next start cannot know whether the server kept the message, so it sends it again with
 * the SAME Message-ID (RFC 5322 §3.6.4), which receiving systems and clients use to collapse duplicates, and logs
 * a warning naming the recipient. We prefer a possible duplicate to a lost health advisory. Claims of a live
 * process are never taken over.
 */
import { hostname } from 'node:os';
import { randomUUID } from 'node:crypto';
import type Mail from 'nodemailer/lib/mailer/index.js';
import type { DeliveryConfig } from '../config/service-config.ts';
import { describeError } from '../core/errors.ts';
import { readBulletin, type StoredBulletin } from '../ledger/bulletins.ts';
import {
  claimDelivery,
  dueNotices,
  getDelivery,
  listDeliveries,
  markDelivery,
  markNoticesDone,
  releaseClaim,
  toReceipt,
  type DeliveryRecord,
} from '../ledger/deliveries.ts';
import type { Ledger } from '../ledger/open-ledger.ts';
import type { Logger } from '../core/log.ts';
import { isProcessAlive } from '../core/process-alive.ts';
import type { DeliveryReceipt } from '../bulletin-types.ts';
import { composeMessage, messageIdFor, renderEml } from './compose-message.ts';
import { notifyOperators } from './operator-notice.ts';
import { ensureOutboxWritable, htmlWithInlineImages, outboxBaseName, writeOutboxFiles } from './outbox.ts';
import { classifySmtpError, createSmtpTransport, SmtpSendError, type SmtpTransporter } from './smtp-transport.ts';

/** Points where `onStep` is awaited (fault injection in tests: pause, crash). */
export type DeliveryStep = 'claimed' | 'accepted' | 'recorded';

export interface DeliverOptions {
  /** Only this run's deliveries (default: every pending delivery in the ledger). */
  readonly runId?: number;
  readonly sleep?: (ms: number) => Promise<void>;
  readonly env?: NodeJS.ProcessEnv;
  readonly onStep?: (step: DeliveryStep, delivery: DeliveryRecord) => Promise<void> | void;
  /** A `sending` claim from another host is taken over after this long (default 3600 s). */
  readonly staleClaimSeconds?: number;
}

export interface DeliverySummary {
  readonly receipts: readonly DeliveryReceipt[];
  readonly sent: number;
  readonly outbox: number;
  readonly failed: number;
  /** Left pending for the next run (nothing could be tried). */
  readonly pending: number;
  /** Claims of dead processes put back to pending and retried (possible duplicates, same Message-ID). */
  readonly reclaimed: number;
}

/** Claim tokens of deliverPending calls running in this process. */
const activeTokens = new Set<string>();

const defaultSleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

/** Put `sending` rows whose claimer is gone back to pending; returns how many. */
function reclaimDeadClaims(ledger: Ledger, staleClaimSeconds: number, log: Logger): number {
  let reclaimed = 0;
  for (const d of listDeliveries(ledger, { statuses: ['sending'] })) {
    const [host, pidText, token] = (d.claimedBy ?? '').split(':');
    const pid = Number(pidText);
    const ageSeconds = (ledger.now().getTime() - Date.parse(d.claimedAt ?? '')) / 1000;
    const claimerAlive =
      host === hostname() ? activeTokens.has(token) || (pid !== process.pid && isProcessAlive(pid)) : !(ageSeconds > staleClaimSeconds);
    if (claimerAlive) continue;
    const note = `claim by ${d.claimedBy} abandoned (process ended during sending); re-sent with the same Message-ID`;
    if (releaseClaim(ledger, d.id, d.claimedBy ?? '', note)) {
      reclaimed++;
      log.warn('re-sending a delivery interrupted during SMTP; the recipient may get it twice (same Message-ID)', {
        deliveryId: d.id,
        recipient: d.recipient,
        messageId: d.messageId,
      });
    }
  }
  return reclaimed;
}

async function sendWithRetry(
  transport: SmtpTransporter,
  message: Mail.Options,
  delivery: DeliveryConfig,
  sleep: (ms: number) => Promise<void>,
  log: Logger,
): Promise<void> {
  for (let attempt = 0; ; attempt++) {
    try {
      await transport.sendMail(message);
      return;
    } catch (err) {
      const failure = classifySmtpError(err);
      if (!failure.temporary || attempt >= delivery.retries) throw new SmtpSendError(failure);
      const waitMs = delivery.retryBaseSeconds * 1000 * 2 ** attempt;
      log.warn('temporary SMTP failure, will retry', { to: message.to, attempt: attempt + 1, waitMs, error: failure.detail });
      await sleep(waitMs);
    }
  }
}

function loginRefusedText(delivery: DeliveryConfig, detail: string): string {
  return `SMTP server ${delivery.smtp?.host}:${delivery.smtp?.port} refused the login of ${delivery.smtp?.user ?? '(no user)'}: ${detail}`;
}

function loginFix(delivery: DeliveryConfig): string {
  return `check delivery.smtp.user and the password in ${delivery.smtp?.passwordEnv ?? 'the variable named by delivery.smtp.password-env'}, then forward the outbox copies`;
}

/** One line per failure for the operator notice. */
function describeFailure(d: DeliveryRecord & { team: string }): string {
  const where = d.status === 'pending' ? 'still pending, retried at the next run' : d.outboxPath ? `copy in ${d.outboxPath}` : 'no copy';
  return `- ${d.recipient} (${d.team}, forecast ${d.forecastKey}): ${d.status}; ${d.lastError ?? ''} — ${where}`;
}

/** Tell the operators of every failure not yet told (this call's and any a crash left untold). */
async function noticeFailures(ledger: Ledger, transport: SmtpTransporter | null, delivery: DeliveryConfig, log: Logger): Promise<void> {
  const due = dueNotices(ledger);
  if (due.length === 0) return;
  const result = await notifyOperators(
    transport,
    delivery,
    `${due.length} bulletin deliveries failed`,
    `Forelight could not deliver these bulletins by e-mail:\n\n${due.map(describeFailure).join('\n')}\n\n` +
      'Forward the outbox copies by hand or fix the addresses in the teams configuration.\n',
    log,
  );
  if (result.status !== 'failed')
    markNoticesDone(
      ledger,
      due.map((d) => d.id),
    );
}

export async function deliverPending(
  ledger: Ledger,
  delivery: DeliveryConfig,
  log: Logger,
  options: DeliverOptions = {},
): Promise<DeliverySummary> {
  const sleep = options.sleep ?? defaultSleep;
  const reclaimed = reclaimDeadClaims(ledger, options.staleClaimSeconds ?? 3600, log);
  const todo = listDeliveries(ledger, { statuses: ['pending'], runId: options.runId });
  const receipts: DeliveryReceipt[] = [];
  const counts = { sent: 0, outbox: 0, failed: 0, pending: 0 };
  if (todo.length === 0 && dueNotices(ledger).length === 0) return { receipts, ...counts, reclaimed };

  // Problems that affect every message are raised before anything is claimed: all stay pending.
  const transport = delivery.smtp ? createSmtpTransport(delivery.smtp, options.env ?? process.env) : null;
  if (!transport && todo.length > 0) ensureOutboxWritable(delivery.outbox);

  const token = randomUUID();
  const claimer = `${hostname()}:${process.pid}:${token}`;
  const bulletins = new Map<number, StoredBulletin>();
  /** Set once the server refused the login: the error every remaining delivery of this call carries. */
  let loginRefused: string | null = null;
  activeTokens.add(token);
  try {
    for (const pending of todo) {
      const bulletin = bulletins.get(pending.bulletinRowId) ?? readBulletin(ledger, pending.bulletinRowId);
      bulletins.set(bulletin.rowId, bulletin);
      const claimed = claimDelivery(
        ledger,
        pending.id,
        claimer,
        messageIdFor(bulletin.runId, bulletin.id, pending.recipient, delivery.from),
      );
      if (!claimed) continue;
      await options.onStep?.('claimed', claimed);
      const message = composeMessage(bulletin, claimed.recipient, delivery.from, claimed.messageId ?? '');
      const dlog = log.child({ deliveryId: claimed.id, bulletin: bulletin.id, recipient: claimed.recipient });
      let status: 'sent' | 'outbox' | 'failed' = 'outbox';
      let error: string | undefined;
      if (transport && !loginRefused) {
        const sendError = await sendWithRetry(transport, message, delivery, sleep, dlog).then(
          () => null,
          (err: unknown) => err,
        );
        if (sendError === null) {
          await options.onStep?.('accepted', claimed);
          status = 'sent';
        } else {
          const failure = sendError instanceof SmtpSendError ? sendError.failure : undefined;
          if (failure?.auth) {
            // Wrong credentials fail every message alike: the rest go straight to the outbox, no more logins tried.
            loginRefused = `${loginRefusedText(delivery, failure.detail)} — ${loginFix(delivery)}`;
            dlog.error('SMTP login refused; every bulletin of this run goes to the outbox', { error: failure.detail });
          }
          status = failure && !failure.temporary && !failure.auth ? 'failed' : 'outbox';
          error = failure?.auth ? (loginRefused ?? undefined) : (failure?.detail ?? describeError(sendError));
        }
      } else if (loginRefused) {
        error = loginRefused;
      }
      let outboxPath: string | undefined;
      if (status !== 'sent') {
        try {
          [outboxPath] = writeOutboxFiles(
            delivery.outbox,
            outboxBaseName(bulletin.forecastKey, bulletin.runId, bulletin.team, claimed.recipient),
            [
              { ext: 'eml', content: await renderEml(message) },
              { ext: 'html', content: htmlWithInlineImages(bulletin) },
            ],
          );
        } catch (err) {
          // Not sent and no copy: keep it pending for the next run, never drop it.
          markDelivery(ledger, claimed.id, 'pending', {
            error: [error, describeError(err)].filter(Boolean).join(' | '),
            noticeDue: !!transport,
          });
          counts.pending++;
          dlog.error('delivery kept pending: outbox not writable', { error: describeError(err) });
          if (!transport) throw err;
          continue;
        }
        if (transport && !loginRefused)
          dlog.error(status === 'failed' ? 'recipient rejected the bulletin' : 'bulletin not delivered after retries', {
            error,
            outboxPath,
          });
      }
      markDelivery(ledger, claimed.id, status, { error, outboxPath, noticeDue: !!transport && status !== 'sent' });
      counts[status]++;
      const done = getDelivery(ledger, claimed.id);
      receipts.push(toReceipt({ ...done, status }, bulletin.id));
      await options.onStep?.('recorded', done);
    }
    // After a refused login the notice cannot go by SMTP either: straight to the outbox.
    await noticeFailures(ledger, loginRefused ? null : transport, delivery, log);
  } finally {
    activeTokens.delete(token);
    transport?.close();
  }
  log.info('delivery finished', { ...counts, reclaimed });
  return { receipts, ...counts, reclaimed };
}
