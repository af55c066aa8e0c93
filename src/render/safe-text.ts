/**
 * Escaping for text that leaves the renderer outside nunjucks' HTML autoescape: mail headers, XML (CAP) and SVG.
 */

/**
 * Text safe for a single mail header line (subject, display name): CR, LF and every other C0/C1 control
 * character or Unicode line/paragraph separator become one space, runs of spaces collapse, ends are trimmed.
 * This is what stops a YAML region name such as "X\r\nBcc: y@z" from adding a header.
 */
export function toHeaderText(value: string): string {
  return value
    .replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]+/g, ' ')
    .replace(/ {2,}/g, ' ')
    .trim();
}

/**
 * Longest subject line Forelight sends, in characters. RFC 5322 §2.1.1 limits a header line to 998 characters and
 * recommends 78; mail clients show roughly the first 60–100. 160 keeps the stage of a few regions visible.
 */
export const MAX_SUBJECT_CHARS = 160;

/** A header text cut to `max` characters at the last "; " or space before the limit, ending with "…". */
export function capHeaderText(value: string, max = MAX_SUBJECT_CHARS): string {
  const text = toHeaderText(value);
  const chars = [...text];
  if (chars.length <= max) return text;
  const head = chars.slice(0, max - 1).join('');
  const between = head.lastIndexOf('; ');
  const cut = between > max / 2 ? between : head.lastIndexOf(' ');
  return `${(cut > max / 2 ? head.slice(0, cut) : head).replace(/[;,\s]+$/, '')} …`;
}

/** Escape the five XML special characters (element content and attribute values). */
export function escapeXml(value: string): string {
  return value.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&apos;');
}

/** Drop characters that XML 1.0 forbids (C0 controls except tab/LF/CR, U+FFFE, U+FFFF, lone surrogates). */
export function toXmlChars(value: string): string {
  return value.replace(
    /[\u0000-\u0008\u000b\u000c\u000e-\u001f\ufffe\uffff]|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g,
    '',
  );
}

/**
 * A token made of `[A-Za-z0-9._-]` only (file names, CAP identifiers, content ids), never starting with a dot, so that
 * used as a path part it can be neither `.`, `..` nor a hidden file.
 */
export function toToken(value: string): string {
  return value.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^[-.]+|-+$/g, '');
}
