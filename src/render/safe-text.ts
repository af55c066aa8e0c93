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

/** Escape the five XML special characters (element content and attribute values). */
export function escapeXml(value: string): string {
  return value
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&apos;');
}

/** Drop characters that XML 1.0 forbids (C0 controls except tab/LF/CR, U+FFFE, U+FFFF, lone surrogates). */
export function toXmlChars(value: string): string {
  return value.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\ufffe\uffff]|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g, '');
}

/** A token made of `[A-Za-z0-9._-]` only (file names, CAP identifiers, content ids). */
export function toToken(value: string): string {
  return value.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '');
}
