/**
 * Reads the per-range rows of a plain-text bulletin (templates/_text.njk: a range line "… · <stage words>: <glyph>
 * <label>[ — why]", then one row per merged lead "<dates>: <glyph> <label>, <chance> (<normal>)[, why]") and lists
 * the rows that point to a stage above their range's stage without any words of why. Works on the text as sent, in
 * any language, independently of the view model the consistency checker reads.
 */
export interface SilentRow {
  readonly range: string;
  readonly row: string;
}

export function rowsAboveStageWithoutReason(text: string, glyphs: readonly string[], noForecastGlyph = '⊘'): SilentRow[] {
  const rank = (g: string) => (g === noForecastGlyph ? -1 : glyphs.indexOf(g));
  const glyph = `[${[...glyphs, noForecastGlyph].join('')}]`;
  const rangeLine = new RegExp(`^ {3}\\S.* · .*?(${glyph}) [^—]*( — .+)?$`);
  const rowLine = new RegExp(`^ {5}\\S.*? ?: (${glyph}) [^,]+, [^(]*\\([^)]*\\)(, .+)?$`);
  const silent: SilentRow[] = [];
  let range: { line: string; rank: number } | null = null;
  for (const line of text.split('\n')) {
    const r = rangeLine.exec(line);
    if (r) {
      range = { line: line.trim(), rank: rank(r[1]) };
      continue;
    }
    const row = rowLine.exec(line);
    if (row && range && rank(row[1]) > range.rank && !row[2]) silent.push({ range: range.line, row: line.trim() });
    if (!line.startsWith('   ')) range = null;
  }
  return silent;
}

/** How many rows of the text were read (so that a test knows the parser saw the tables at all). */
export function countRows(text: string, glyphs: readonly string[]): number {
  const glyph = `[${[...glyphs, '⊘'].join('')}]`;
  return text.split('\n').filter((l) => new RegExp(`^ {5}\\S.*? ?: ${glyph} [^,]+, [^(]*\\([^)]*\\)`).test(l)).length;
}
