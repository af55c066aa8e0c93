/**
 * Checks that JSON read back from a file (status file, lock file, caches, archive entries) has the shape its
 * type promises, with ajv and a JSON Schema (draft 2020-12) written next to the type, instead of trusting a
 * cast. The result names the first mismatch by JSON pointer, for the error or note the caller gives.
 */
import { Ajv2020 } from 'ajv/dist/2020.js';

const ajv = new Ajv2020({ allErrors: false, strict: true, allowUnionTypes: true });

export type ShapeCheck<T> = (value: unknown) => { readonly ok: true; readonly value: T } | { readonly ok: false; readonly why: string };

/** A checker for `T` from its JSON Schema (compiled once). */
export function jsonShape<T>(schema: Record<string, unknown>): ShapeCheck<T> {
  const validate = ajv.compile<T>(schema);
  return (value) => {
    if (validate(value)) return { ok: true, value };
    const e = validate.errors?.[0];
    return { ok: false, why: e ? `${e.instancePath || '/'} ${e.message ?? 'is not valid'}` : 'is not valid' };
  };
}

/** Parses `text` as JSON and checks its shape; a parse error is reported like a mismatch. */
export function parseShaped<T>(
  text: string,
  check: ShapeCheck<T>,
  reviver?: (key: string, value: unknown) => unknown,
): ReturnType<ShapeCheck<T>> {
  let value: unknown;
  try {
    value = JSON.parse(text, reviver);
  } catch (err) {
    return { ok: false, why: `not JSON (${err instanceof Error ? err.message : String(err)})` };
  }
  return check(value);
}
