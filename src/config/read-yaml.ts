/**
 * Bounded YAML reading: size limit before reading, YAML 1.2 core schema only (no custom tags, no code),
 * unique keys, and a cap on alias expansion so that an "alias bomb" cannot exhaust memory.
 */
import { readFile, stat } from 'node:fs/promises';
import { LineCounter, parseDocument, type Document } from 'yaml';
import { diagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { displayPath } from './source-map.ts';

export const MAX_CONFIG_BYTES = 1024 * 1024;
export const MAX_ALIAS_COUNT = 100;

export type YamlRead =
  | { readonly ok: true; readonly doc: Document; readonly lineCounter: LineCounter; readonly value: unknown; readonly problems: readonly Diagnostic[] }
  /** The file could not be read at all; the caller places the message (e.g. at the include key). */
  | { readonly ok: false; readonly message: string; readonly fix: string };

export async function readYamlFile(file: string): Promise<YamlRead> {
  let size: number;
  try {
    size = (await stat(file)).size;
  } catch (err) {
    return { ok: false, message: `cannot read ${displayPath(file)} (${(err as NodeJS.ErrnoException).code ?? String(err)})`, fix: 'check the path (relative to the including file)' };
  }
  if (size > MAX_CONFIG_BYTES) {
    return { ok: false, message: `${displayPath(file)} is ${size} bytes, over the ${MAX_CONFIG_BYTES}-byte limit for configuration files`, fix: 'remove the bulk or split regions and teams into included files' };
  }
  const text = await readFile(file, 'utf8');
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true, schema: 'core', merge: false, strict: true });
  const yamlProblem = (line: number, column: number, message: string, hint: string) =>
    diagnostic('config-yaml', message, hint, { file: displayPath(file), line, column });
  const problems: Diagnostic[] = [];
  for (const e of doc.errors) {
    const pos = lineCounter.linePos(e.pos[0]);
    problems.push(yamlProblem(pos.line, pos.col, `YAML syntax: ${e.message.split('\n')[0]}`, 'fix the YAML at this position'));
  }
  for (const w of doc.warnings) {
    const pos = lineCounter.linePos(w.pos[0]);
    const custom = w.code === 'TAG_RESOLVE_FAILED';
    problems.push(custom
      ? yamlProblem(pos.line, pos.col, `custom YAML tags are not allowed (${w.message.split('\n')[0]})`, 'write plain values without tags')
      : yamlProblem(pos.line, pos.col, `YAML: ${w.message.split('\n')[0]}`, 'fix the YAML at this position'));
  }
  if (problems.length > 0) return { ok: true, doc, lineCounter, value: undefined, problems };
  let value: unknown;
  try {
    value = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
  } catch (err) {
    return { ok: true, doc, lineCounter, value: undefined, problems: [yamlProblem(1, 1, `YAML aliases expand too much (${(err as Error).message}; limit ${MAX_ALIAS_COUNT})`, 'write the values out instead of nesting *aliases')] };
  }
  return { ok: true, doc, lineCounter, value, problems };
}
