/**
 * Semantic checks on a combination matrix (escalation.combine.matrix): known indicators, no indicator on both
 * axes, a square table with one row and one column per stage, known stages, and a table that never lowers the
 * region's stage when either input rises (monotonic along rows and columns), nor goes below the two inputs.
 */
import { ids, known, list, obj, oneOf, text, type RawObject } from './raw-access.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';

export function checkCombine(raw: RawObject): ConfigProblem[] {
  const matrix = obj(obj(obj(raw.escalation).combine).matrix);
  if (Object.keys(matrix).length === 0) return [];
  const out: ConfigProblem[] = [];
  const at = (...p: (string | number)[]) => pointerOf('escalation', 'combine', 'matrix', ...p);
  const indicators = known(ids(raw.indicators));
  const stages = ids(raw['stage-ladder']);
  const rows = list(matrix.rows).map(text);
  const columns = list(matrix.columns).map(text);
  rows.forEach((id, i) => {
    if (id !== undefined && !indicators.has(id)) out.push(problem(at('rows', i), `unknown indicator '${id}'`, oneOf(indicators)));
  });
  columns.forEach((id, i) => {
    if (id === undefined) return;
    if (!indicators.has(id)) out.push(problem(at('columns', i), `unknown indicator '${id}'`, oneOf(indicators)));
    else if (rows.includes(id))
      out.push(
        problem(at('columns', i), `indicator '${id}' is on both axes of the matrix`, 'put each indicator in rows or in columns, not both'),
      );
  });
  const table = list(matrix.table).map((r) => list(r).map(text));
  if (table.length !== stages.length) {
    out.push(
      problem(
        at('table'),
        `the table has ${table.length} rows but the ladder has ${stages.length} stages`,
        'write one row per stage, lowest stage first',
      ),
    );
    return out;
  }
  const rank = (id: string | undefined) => (id === undefined ? -1 : stages.indexOf(id));
  table.forEach((row, r) => {
    if (row.length !== stages.length) {
      out.push(
        problem(
          at('table', r),
          `row ${r + 1} has ${row.length} entries but the ladder has ${stages.length} stages`,
          'write one stage id per stage of the ladder, lowest first',
        ),
      );
      return;
    }
    row.forEach((cell, c) => {
      const k = rank(cell);
      if (k < 0) out.push(problem(at('table', r, c), `unknown stage '${cell ?? ''}'`, oneOf(known(stages))));
      else if (k < Math.max(r, c))
        out.push(
          problem(
            at('table', r, c),
            `'${cell}' is lower than an input stage (row ${stages[r]}, column ${stages[c]}): the matrix would hide a warning`,
            `use ${stages[Math.max(r, c)]} or higher`,
          ),
        );
      else if ((c > 0 && k < rank(row[c - 1])) || (r > 0 && k < rank(table[r - 1][c])))
        out.push(
          problem(
            at('table', r, c),
            `'${cell}' is lower than the entry before it: a rising input would lower the region's stage`,
            'make every row and column non-decreasing',
          ),
        );
    });
  });
  return out;
}
