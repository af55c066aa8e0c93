/**
 * Short notices to the operators ("no new forecast data", "deliveries failed"). One message to all operators;
 * when SMTP is not configured or fails, the notice goes to the outbox folder and the log instead.
 */
import type { DeliveryConfig } from '../config/service-config.ts';
import { formatDiagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { describeError } from '../core/errors.ts';
import { silentLogger, type Logger } from '../core/log.ts';
import { renderEml } from './compose-message.ts';
import { safeNamePart, writeOutboxFiles } from './outbox.ts';
import { createSmtpTransport, type SmtpTransporter } from './smtp-transport.ts';

export interface NoticeResult {
  readonly status: 'sent' | 'outbox' | 'failed';
  /** Message-ID, outbox file, or the error. */
  readonly detail: string;
}

/** Send with an existing transport (or none); falls back to the outbox; never throws. */
export async function notifyOperators(
  transport: SmtpTransporter | null,
  delivery: DeliveryConfig,
  subject: string,
  text: string,
  log: Logger,
): Promise<NoticeResult> {
  const message = { from: delivery.from, to: delivery.operators.join(', '), subject: `[forelight] ${subject}`, text };
  let smtpError = '';
  if (transport && delivery.operators.length > 0) {
    try {
      const info = await transport.sendMail(message);
      log.info('operator notice sent', { subject, messageId: info.messageId });
      return { status: 'sent', detail: info.messageId };
    } catch (err) {
      smtpError = describeError(err);
      log.error('operator notice could not be sent by SMTP; writing it to the outbox', { subject, error: smtpError });
    }
  } else if (delivery.operators.length === 0) {
    log.warn('no operators configured (delivery.operators); operator notice written to the outbox only', { subject });
  }
  try {
    const stampPart = new Date().toISOString().replace(/[:.]/g, '');
    const [path] = writeOutboxFiles(delivery.outbox, `notice_${stampPart}_${safeNamePart(subject, 40)}`, [
      { ext: 'eml', content: await renderEml({ ...message, to: message.to || delivery.from }) },
    ]);
    log.warn('operator notice written to the outbox', { subject, path });
    return { status: 'outbox', detail: path };
  } catch (err) {
    log.error('operator notice lost: neither SMTP nor the outbox worked', { subject, text, error: describeError(err), smtpError });
    return { status: 'failed', detail: describeError(err) };
  }
}

/** The notice's text: `text`, then one line per diagnostic (`file:line:col: message — hint`). */
export function noticeText(text: string, diagnostics: readonly Diagnostic[]): string {
  if (diagnostics.length === 0) return text;
  return `${text}\n\nProblems found (${diagnostics.length}):\n${diagnostics.map((d) => `- [${d.code}] ${formatDiagnostic(d)}`).join('\n')}\n`;
}

/** Tell the operators something (e.g. "no new data for 2026-11-26"): SMTP when configured, else the outbox. */
export async function sendOperatorNotice(
  delivery: DeliveryConfig,
  subject: string,
  text: string,
  options: { log?: Logger; env?: NodeJS.ProcessEnv; diagnostics?: readonly Diagnostic[] } = {},
): Promise<NoticeResult> {
  const log = options.log ?? silentLogger;
  let transport: SmtpTransporter | null = null;
  if (delivery.smtp) {
    try {
      transport = createSmtpTransport(delivery.smtp, options.env ?? process.env);
    } catch (err) {
      log.error('SMTP not usable for the operator notice', { error: describeError(err) });
    }
  }
  try {
    return await notifyOperators(transport, delivery, subject, noticeText(text, options.diagnostics ?? []), log);
  } finally {
    transport?.close();
  }
}
