/**
 * One e-mail per bulletin × recipient: HTML with a plain-text alternative and the PNG charts inline
 * (multipart/related, referenced from the HTML as `cid:`), the printable PDF as an ordinary attachment, and a stable Message-ID so that a re-send after
 * a crash carries the same id (mail clients and many servers collapse duplicates by Message-ID).
 */
import { createHash } from 'node:crypto';
import nodemailer from 'nodemailer';
import type Mail from 'nodemailer/lib/mailer/index.js';
import type { StoredBulletin } from '../ledger/bulletins.ts';

/** Domain part of the From address, for Message-IDs ("forelight.invalid" when none can be found). */
export function fromDomain(from: string): string {
  const m = /@([A-Za-z0-9.-]+)>?\s*$/.exec(from);
  return m ? m[1].toLowerCase() : 'forelight.invalid';
}

/** `<hash.forelight@domain>` from run, bulletin id and recipient: stable across restarts, new for a forced run. */
export function messageIdFor(runId: number, bulletinId: string, recipient: string, from: string): string {
  const hash = createHash('sha256').update(`${runId}\0${bulletinId}\0${recipient.toLowerCase()}`).digest('hex').slice(0, 32);
  return `<${hash}.r${runId}.forelight@${fromDomain(from)}>`;
}

export function composeMessage(bulletin: StoredBulletin, recipient: string, from: string, messageId: string): Mail.Options {
  return {
    from,
    to: recipient,
    subject: bulletin.subject,
    text: bulletin.text,
    html: bulletin.html,
    messageId,
    date: new Date(bulletin.createdAt),
    headers: { 'X-Forelight-Forecast': bulletin.forecastKey, 'X-Forelight-Bulletin': bulletin.id },
    // Images are inline parts the HTML references by cid; anything else (the printable PDF) is a plain attachment.
    attachments: bulletin.attachments.map((a) =>
      a.contentType.startsWith('image/')
        ? {
            cid: a.cid,
            filename: a.filename,
            contentType: a.contentType,
            content: Buffer.from(a.content),
            contentDisposition: 'inline' as const,
          }
        : { filename: a.filename, contentType: a.contentType, content: Buffer.from(a.content), contentDisposition: 'attachment' as const },
    ),
  };
}

const emlTransport = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'windows' });

/** The RFC 5322 message (CRLF line ends) exactly as it would go over SMTP. */
export async function renderEml(message: Mail.Options): Promise<Buffer> {
  const info = await emlTransport.sendMail(message);
  return info.message as Buffer;
}
