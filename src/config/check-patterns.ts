/**
 * Path patterns of `forecast-files` (one or a list) and `hindcast-files`: every `{name}` must be a placeholder
 * Forelight fills (src/core/path-patterns.ts). Whether a pattern matches files is checked by `forelight check`
 * with the files at hand (src/pipeline/pattern-check.ts).
 */
import { PLACEHOLDERS, unknownPlaceholders } from '../core/path-patterns.ts';
import { list, obj, text, type RawObject } from './raw-access.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';

/** The patterns of a source's `forecast-files` with their JSON pointers (a list's entries each have their own). */
export function forecastPatterns(source: RawObject, i: number): { pattern: string; pointer: string }[] {
  const value = source['forecast-files'];
  if (Array.isArray(value))
    return value.flatMap((p, k) => (typeof p === 'string' ? [{ pattern: p, pointer: pointerOf('sources', i, 'forecast-files', k) }] : []));
  const one = text(value);
  return one === undefined ? [] : [{ pattern: one, pointer: pointerOf('sources', i, 'forecast-files') }];
}

export function checkPatterns(raw: RawObject): ConfigProblem[] {
  const out: ConfigProblem[] = [];
  list(raw.sources).forEach((s, i) => {
    const source = obj(s);
    const hindcast = text(source['hindcast-files']);
    const all = [
      ...forecastPatterns(source, i),
      ...(hindcast === undefined ? [] : [{ pattern: hindcast, pointer: pointerOf('sources', i, 'hindcast-files') }]),
    ];
    for (const { pattern, pointer } of all) {
      for (const name of unknownPlaceholders(pattern))
        out.push(
          problem(
            pointer,
            `unknown placeholder {${name}} in "${pattern}"`,
            `use one of ${PLACEHOLDERS.map((p) => `{${p}}`).join(', ')} (e.g. {date} for YYYYMMDD)`,
          ),
        );
    }
  });
  return out;
}
