/**
 * The outbox folder: messages that could not (or, with `smtp: null`, should not) be sent by SMTP are written
 * here as `.eml` (RFC 5322, open with any mail client) plus `.html` for a browser. Files are written to a
 * temporary name and renamed, so a crash never leaves half a message; re-writing the same message replaces it.
 */
import type { Bulletin } from '../bulletin-types.ts';
import { rmSync, writeFileSync } from 'node:fs';
import { fixFor, makeFolder, writeFileAtomic } from '../core/write-atomic.ts';
import { createHash } from 'node:crypto';
import { join, resolve, sep } from 'node:path';
import { DeliveryError, errnoCode } from '../core/errors.ts';
import { toToken } from '../render/safe-text.ts';

/** File-name-safe part (a `toToken`: ASCII letters, digits, `.`, `_`, `-`, no leading dot) of at most `max` characters, never empty. */
export function safeNamePart(value: string, max = 80): string {
  return toToken(value).slice(0, max) || 'x';
}

/**
 * `<forecast>_r<run>_<team>_<recipient>-<hash>`, each part made safe (no path traversal from team names or
 * addresses) and short enough for a 255-byte file name; the recipient's full address is hashed in, so two long
 * addresses that share their first characters never share a file.
 */
export function outboxBaseName(forecastKey: string, runId: number, team: string, recipient: string): string {
  const hash = createHash('sha256').update(recipient).digest('hex').slice(0, 8);
  return [safeNamePart(forecastKey), `r${runId}`, safeNamePart(team, 40), `${safeNamePart(recipient, 40)}-${hash}`].join('_');
}

function outboxError(dir: string, err: unknown): DeliveryError {
  const code = errnoCode(err) ?? errnoCode(err instanceof Error ? err.cause : undefined) ?? 'error';
  return new DeliveryError(
    `outbox folder ${dir} is not writable (${code})`,
    `${fixFor(code, dir)} (delivery.outbox); unsent bulletins stay pending in the ledger`,
    false,
    { cause: err },
  );
}

/** Create the folder if needed and prove it is writable (write + remove a probe file). */
export function ensureOutboxWritable(dir: string): void {
  try {
    makeFolder(dir);
    const probe = join(dir, `.probe-${process.pid}`);
    writeFileSync(probe, '');
    rmSync(probe);
  } catch (err) {
    throw outboxError(dir, err);
  }
}

/** Write `<base>.<ext>` files atomically (`base` made safe, never shortened); returns their paths in the given order. */
export function writeOutboxFiles(dir: string, baseName: string, files: readonly { ext: string; content: string | Uint8Array }[]): string[] {
  const root = resolve(dir);
  try {
    makeFolder(root);
    return files.map(({ ext, content }) => {
      const path = join(root, `${safeNamePart(baseName, Infinity)}.${safeNamePart(ext)}`);
      if (!path.startsWith(root + sep)) throw new Error(`refusing to write outside ${root}`);
      writeFileAtomic(path, content, 'deliver');
      return path;
    });
  } catch (err) {
    throw outboxError(dir, err);
  }
}

/**
 * The bulletin's HTML with `cid:` image references replaced by data: URLs of its attachments, so the outbox's
 * `.html` copy shows its charts when opened in a browser (the `.eml` keeps the CID parts).
 */
export function htmlWithInlineImages(bulletin: Pick<Bulletin, 'html' | 'attachments'>): string {
  let html = bulletin.html;
  for (const a of bulletin.attachments) {
    html = html.split(`cid:${a.cid}`).join(`data:${a.contentType};base64,${Buffer.from(a.content).toString('base64')}`);
  }
  return html;
}
