/**
 * Defensive readers over the raw YAML tree: semantic checks run even when the schema found type errors,
 * so every reader returns an empty/undefined value for a wrong type instead of throwing.
 */
import { isRecord } from '../core/json-shape.ts';

export type RawObject = Readonly<Record<string, unknown>>;

export function obj(v: unknown): RawObject {
  return isRecord(v) ? v : {};
}

export function list(v: unknown): readonly unknown[] {
  return Array.isArray(v) ? v : [];
}

export function text(v: unknown): string | undefined {
  return typeof v === 'string' ? v : undefined;
}

export function num(v: unknown): number | undefined {
  return typeof v === 'number' && Number.isFinite(v) ? v : undefined;
}

/** `id` of every entry of a raw list, in order (undefined where missing). */
export function ids(v: unknown): (string | undefined)[] {
  return list(v).map((e) => text(obj(e).id));
}

export function known(values: Iterable<string | undefined>): Set<string> {
  const s = new Set<string>();
  for (const v of values) if (v !== undefined) s.add(v);
  return s;
}

export function oneOf(set: ReadonlySet<string>): string {
  return set.size > 0 ? `use one of: ${[...set].join(', ')}` : 'define it first';
}
