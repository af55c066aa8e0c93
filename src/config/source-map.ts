/**
 * Positions of every key and value of the loaded YAML files, addressed by JSON pointer into the merged raw
 * tree, so that any problem found after parsing (schema, semantics, grids) can name file:line:column.
 */
import { relative } from 'node:path';
import { isAlias, isMap, isScalar, isSeq, type Document, type LineCounter, type Node } from 'yaml';
import type { DiagnosticCode } from '../core/diagnostic-codes.ts';
import { diagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { parentPointer, pointerOf, type ConfigProblem } from './problem.ts';

export interface SourcePosition {
  readonly file: string;
  /** 1-based. */
  readonly line: number;
  /** 1-based. */
  readonly column: number;
}

interface Entry {
  readonly key?: SourcePosition;
  readonly value: SourcePosition;
}

export class ConfigSourceMap {
  private readonly entries = new Map<string, Entry>();

  /** Records every node of `doc` under `basePointer` (the root of an included file goes under `/regions`). */
  addDocument(file: string, doc: Document, lineCounter: LineCounter, basePointer = '', rootKey?: SourcePosition): void {
    const at = (offset: number): SourcePosition => {
      const { line, col } = lineCounter.linePos(offset);
      return { file, line, column: col };
    };
    const visit = (node: Node | null | undefined, pointer: string, key: SourcePosition | undefined, fallback: SourcePosition): void => {
      const value = node?.range ? at(node.range[0]) : (key ?? fallback);
      this.entries.set(pointer, { key, value });
      if (!node || isAlias(node)) return;
      if (isMap(node)) {
        for (const pair of node.items) {
          const keyNode = pair.key as Node | null;
          const name = isScalar(keyNode) ? String(keyNode.value) : String(keyNode);
          const keyPos = keyNode?.range ? at(keyNode.range[0]) : value;
          visit(pair.value as Node | null, pointer + pointerOf(name), keyPos, keyPos);
        }
      } else if (isSeq(node)) {
        node.items.forEach((item, i) => visit(item as Node | null, pointer + pointerOf(i), undefined, value));
      }
    };
    visit(doc.contents as Node | null, basePointer, rootKey, { file, line: 1, column: 1 });
  }

  /** Position of the node at `pointer`, or of its nearest recorded ancestor. */
  locate(pointer: string, at: 'key' | 'value' = 'value'): SourcePosition {
    let p = pointer;
    let exact = true;
    for (;;) {
      const entry = this.entries.get(p);
      if (entry) return (at === 'key' || !exact) && entry.key ? entry.key : entry.value;
      if (p === '') return { file: '?', line: 1, column: 1 };
      p = parentPointer(p);
      exact = false;
    }
  }

  /** The problem as a diagnostic placed at its file (relative to the working directory), line and column. */
  place(code: DiagnosticCode, p: ConfigProblem): Diagnostic {
    const pos = this.locate(p.pointer, p.at);
    return diagnostic(code, p.message, p.fix, { file: displayPath(pos.file), pointer: p.pointer, line: pos.line, column: pos.column });
  }
}

export function displayPath(file: string): string {
  const rel = relative(process.cwd(), file);
  return rel && !rel.startsWith('..') ? rel : file;
}
