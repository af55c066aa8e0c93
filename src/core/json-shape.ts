/**
 * Checks that JSON read back from a file (status file, lock file, caches, archive entries) has the shape its
 * type promises, with ajv and a JSON Schema (draft 2020-12) written next to the type, instead of trusting a
 * cast. The result names the first mismatch by JSON pointer, for the error or note the caller gives.
 */
import { Ajv2020 } from 'ajv/dist/2020.js';

const options = { allErrors: false, strict: true, allowUnionTypes: true };
const ajv = new Ajv2020(options);
/** For values revived from a stored form that keeps NaN and ±Infinity (ajv's `strictNumbers` off: `number` accepts them). */
const ajvNonFinite = new Ajv2020({ ...options, strictNumbers: false });

/** Whether a JSON value is an object (not null, not an array): a type guard for hand-written checks. */
export const isRecord = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === 'object' && !Array.isArray(v);

export type ShapeCheck<T> = (value: unknown) => { readonly ok: true; readonly value: T } | { readonly ok: false; readonly why: string };

/** A checker for `T` from its JSON Schema (compiled once); `nonFinite`: a `number` may be NaN or ±Infinity. */
export function jsonShape<T>(schema: Record<string, unknown>, opts: { readonly nonFinite?: boolean } = {}): ShapeCheck<T> {
  const validate = (opts.nonFinite ? ajvNonFinite : ajv).compile<T>(schema);
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
