/**
 * Bounded YAML reading: size limit before reading, YAML 1.2 core schema only (no custom tags, no code),
 * unique keys, and a cap on alias expansion so that an "alias bomb" cannot exhaust memory.
 */
import { readFile, stat } from 'node:fs/promises';
import { LineCounter, parseDocument, type Document } from 'yaml';
import { diagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { displayPath } from './source-map.ts';
import { errnoCode, errorMessage } from '../core/errors.ts';

export const MAX_CONFIG_BYTES = 1024 * 1024;
export const MAX_ALIAS_COUNT = 100;

export type YamlRead =
  | {
      readonly ok: true;
      readonly doc: Document;
      readonly lineCounter: LineCounter;
      readonly value: unknown;
      readonly problems: readonly Diagnostic[];
    }
  /** The file could not be read at all; the caller places the message (e.g. at the include key). */
  | { readonly ok: false; readonly message: string; readonly fix: string };

/** Offset of the first byte that does not start or continue a valid UTF-8 sequence (RFC 3629 §4), or null. */
export function firstInvalidUtf8(bytes: Uint8Array): number | null {
  const decoder = new TextDecoder('utf-8', { fatal: true });
  try {
    decoder.decode(bytes);
    return null;
  } catch {
    // Narrow down by halves: the longest valid prefix ends where the bad sequence starts.
    let lo = 0;
    let hi = bytes.length;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (validPrefix(bytes, mid)) lo = mid;
      else hi = mid;
    }
    // bytes[0, lo) may end inside a sequence that the next byte broke: the bad sequence starts at its lead byte.
    let start = validPrefix(bytes, hi) ? hi : lo;
    while (start > 0 && !validPrefix(bytes, start, false)) start--;
    return start;
  }
}

/** Whether bytes[0, end) decodes (with `cut`, a sequence cut at `end` is allowed). */
function validPrefix(bytes: Uint8Array, end: number, cut = true): boolean {
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(0, end), { stream: cut });
    return true;
  } catch {
    return false;
  }
}

/** 1-based line and column (in characters of the valid text before it) of a byte offset. */
function positionOf(bytes: Uint8Array, offset: number): { line: number; col: number } {
  const before = Buffer.from(bytes.subarray(0, offset)).toString('utf8');
  const lines = before.split('\n');
  return { line: lines.length, col: [...lines[lines.length - 1]].length + 1 };
}

export async function readYamlFile(file: string): Promise<YamlRead> {
  let size: number;
  try {
    size = (await stat(file)).size;
  } catch (err) {
    return {
      ok: false,
      message: `cannot read ${displayPath(file)} (${errnoCode(err) ?? String(err)})`,
      fix: 'check the path (relative to the including file)',
    };
  }
  if (size > MAX_CONFIG_BYTES) {
    return {
      ok: false,
      message: `${displayPath(file)} is ${size} bytes, over the ${MAX_CONFIG_BYTES}-byte limit for configuration files`,
      fix: 'remove the bulk or split regions and teams into included files',
    };
  }
  let bytes: Buffer;
  try {
    bytes = await readFile(file);
  } catch (err) {
    const code = errnoCode(err);
    return {
      ok: false,
      message: `cannot read ${displayPath(file)} (${code === 'EISDIR' ? 'it is a folder' : (code ?? String(err))})`,
      fix: code === 'EISDIR' ? 'name the YAML file inside it' : 'check the path and its permissions',
    };
  }
  const bad = firstInvalidUtf8(bytes);
  if (bad !== null) {
    const { line, col } = positionOf(bytes, bad);
    return {
      ok: true,
      doc: parseDocument(''),
      lineCounter: new LineCounter(),
      value: undefined,
      problems: [
        diagnostic(
          'config-yaml',
          `byte 0x${bytes[bad].toString(16).padStart(2, '0')} is not UTF-8 (YAML 1.2 §5.2 requires Unicode)`,
          'save the file as UTF-8 (e.g. iconv -f latin1 -t utf-8)',
          { file: displayPath(file), line, column: col },
        ),
      ],
    };
  }
  const text = bytes.toString('utf8');
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
    problems.push(
      custom
        ? yamlProblem(
            pos.line,
            pos.col,
            `custom YAML tags are not allowed (${w.message.split('\n')[0]})`,
            'write plain values without tags',
          )
        : yamlProblem(pos.line, pos.col, `YAML: ${w.message.split('\n')[0]}`, 'fix the YAML at this position'),
    );
  }
  if (problems.length > 0) return { ok: true, doc, lineCounter, value: undefined, problems };
  let value: unknown;
  try {
    value = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
  } catch (err) {
    return {
      ok: true,
      doc,
      lineCounter,
      value: undefined,
      problems: [
        yamlProblem(
          1,
          1,
          `YAML aliases expand too much (${errorMessage(err)}; limit ${MAX_ALIAS_COUNT})`,
          'write the values out instead of nesting *aliases',
        ),
      ],
    };
  }
  return { ok: true, doc, lineCounter, value, problems };
}
