/**
 * A configuration problem before it is given a file position: where (JSON pointer into the raw YAML tree,
 * and whether the key or the value is at fault), what is wrong and how to fix it.
 */
export interface ConfigProblem {
  /** JSON pointer into the raw (merged) YAML tree, e.g. `/trigger-rules/3/probability`. */
  readonly pointer: string;
  /** Point at the key (unknown keys, forbidden keys) or at the value (everything else). */
  readonly at: 'key' | 'value';
  readonly message: string;
  readonly fix: string;
}

export function problem(pointer: string, message: string, fix: string, at: 'key' | 'value' = 'value'): ConfigProblem {
  return { pointer, at, message, fix };
}

/** JSON pointer from path segments (RFC 6901 escaping). */
export function pointerOf(...segments: readonly (string | number)[]): string {
  return segments.map((s) => '/' + String(s).replace(/~/g, '~0').replace(/\//g, '~1')).join('');
}

/** Parent pointer of a JSON pointer ('' for the root). */
export function parentPointer(pointer: string): string {
  const i = pointer.lastIndexOf('/');
  return i <= 0 ? '' : pointer.slice(0, i);
}
