/**
 * Locale typography applied to every sentence a bulletin prints (catalogue messages and operator texts alike),
 * so an operator who types "Signes : sueurs" in the YAML still gets correct French.
 *
 * French (Imprimerie nationale, "Lexique des règles typographiques en usage à l'Imprimerie nationale", 2002,
 * ponctuation): a no-break space (U+00A0) before the colon and inside « guillemets », a narrow no-break space
 * (U+202F) before ; ! ? and before %, as Intl's fr percent format also writes it. Other locales: unchanged.
 */

const NBSP = '\u00a0';
const NNBSP = '\u202f';

/** Text with the locale's spacing rules applied; idempotent. */
export function applyTypography(locale: string, text: string): string {
  if (locale !== 'fr' && !locale.startsWith('fr-')) return text;
  return (
    text
      // an ordinary space (or none) before a high sign becomes the right no-break space; never inside URLs or clock times
      .replace(/(?<=\S) (?=:)|(?<=[^\s/:])(?=:(?:\s|$))/g, NBSP)
      .replace(/(?<=\S) (?=[;!?%])|(?<=[^\s/\u00a0\u202f;!?])(?<!&[#a-zA-Z0-9]+)(?=[;!?](?:\s|$))/g, NNBSP)
      .replace(/(?<=\d)(?=%)/g, NNBSP)
      .replace(/«[ \u00a0]?/g, `«${NBSP}`)
      .replace(/[ \u00a0]?»/g, `${NBSP}»`)
  );
}

/** The same rules on the text between the tags of an HTML document (markup, attributes and entities untouched). */
export function applyTypographyHtml(locale: string, html: string): string {
  if (locale !== 'fr' && !locale.startsWith('fr-')) return html;
  return html.replace(/>([^<]+)</g, (_m, text: string) => `>${applyTypography(locale, text)}<`);
}

/** Places where a French text breaks the rules above: a high sign without a no-break space before it. */
export function frenchSpacingFaults(text: string): string[] {
  const faults: string[] = [];
  // Only signs that end a word (followed by a space, the end, or markup) are punctuation; "07:30", "cid:x", "?a=1" are not.
  for (const m of text.matchAll(/(?<=(.))([:;!?%])(?=\s|$|<|"|\))/gs)) {
    const prev = m[1];
    if (prev === NBSP || prev === NNBSP || prev === '>' || prev === '\n') continue;
    const at = m.index ?? 0;
    faults.push(text.slice(Math.max(0, at - 12), at + 1));
  }
  return faults;
}
