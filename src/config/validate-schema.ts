/**
 * JSON Schema validation of the raw (merged) YAML tree with ajv, every error turned into a ConfigProblem
 * with plain words and a fix. The schema is config/forelight.schema.json of this package.
 */
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { Ajv2020, type DefinedError, type ValidateFunction } from 'ajv/dist/2020.js';
import { packagePath } from '../core/package-root.ts';
import { problem, pointerOf, type ConfigProblem } from './problem.ts';

export const SCHEMA_URL = pathToFileURL(packagePath('config/forelight.schema.json'));

let compiled: ValidateFunction | undefined;

function validator(): ValidateFunction {
  if (!compiled) {
    const ajv = new Ajv2020({ allErrors: true, verbose: true, strict: true, allowUnionTypes: true });
    const schema: unknown = JSON.parse(readFileSync(SCHEMA_URL, 'utf8'));
    if (schema === null || typeof schema !== 'object') throw new Error(`${SCHEMA_URL.pathname} is not a JSON Schema: reinstall Forelight`);
    compiled = ajv.compile(schema);
  }
  return compiled;
}

const SECRET_KEY = /^(smtp-)?pass(word)?$|^secret$|^token$/i;

export function validateAgainstSchema(raw: unknown): ConfigProblem[] {
  const validate = validator();
  if (validate(raw)) return [];
  const out: ConfigProblem[] = [];
  const seen = new Set<string>();
  // ajv's own keywords only (strict mode, no custom keywords): its errors are the `DefinedError` union, keyed by keyword.
  for (const e of (validate.errors ?? []) as DefinedError[]) {
    // "must match then": the branch's own errors (e.g. an indicator kind's params) are reported instead.
    if (e.keyword === 'if') continue;
    const p = describeSchemaError(e);
    const key = `${p.pointer}|${p.message}`;
    if (!seen.has(key)) {
      seen.add(key);
      out.push(p);
    }
  }
  return out;
}

function show(v: unknown): string {
  if (typeof v === 'string') return JSON.stringify(v.length > 40 ? v.slice(0, 40) + '…' : v);
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'object') return 'a mapping';
  return String(v);
}

function keyName(pointer: string): string {
  const last = pointer.slice(pointer.lastIndexOf('/') + 1);
  return last.replace(/~1/g, '/').replace(/~0/g, '~');
}

/** A probability written as percent (70) is almost always meant as 0.7. */
function probabilityFix(v: number): string {
  return v > 1 && v <= 100
    ? `write ${+(v / 100).toFixed(4)} (probabilities are fractions, not percent)`
    : 'write a fraction between 0 and 1';
}

function describeSchemaError(e: DefinedError): ConfigProblem {
  const ps: Record<string, unknown> = e.parentSchema ?? {};
  const help = typeof ps.description === 'string' ? ps.description : 'see the schema description';
  const at = e.instancePath;
  switch (e.keyword) {
    case 'additionalProperties': {
      const key = e.params.additionalProperty;
      const ptr = at + pointerOf(key);
      if (SECRET_KEY.test(key)) {
        return problem(
          ptr,
          `a secret must not be written in the configuration ("${key}")`,
          'put the password in an environment variable and name it in password-env',
          'key',
        );
      }
      const allowed = Object.keys(e.parentSchema?.properties ?? {});
      const fix =
        allowed.length > 0
          ? `remove it or fix the spelling; allowed here: ${allowed.join(', ')}`
          : `remove it or fix the spelling; ${help}`;
      return problem(ptr, `unknown key "${key}"`, fix, 'key');
    }
    case 'required': {
      const key = e.params.missingProperty;
      const description: unknown = e.parentSchema?.properties?.[key]?.description;
      return problem(at, `missing key "${key}"`, `add ${key}: ${typeof description === 'string' ? description : ''}`.trim(), 'key');
    }
    case 'type':
      return problem(at, `expected ${String(e.params.type).replace(',', ' or ')}, got ${show(e.data)}`, help);
    case 'enum': {
      const allowed = e.params.allowedValues.map(String).join(', ');
      return problem(at, `${show(e.data)} is not one of: ${allowed}`, `use one of: ${allowed}`);
    }
    case 'minimum':
    case 'maximum':
    case 'exclusiveMinimum':
    case 'exclusiveMaximum':
      return describeRangeError(at, ps, Number(e.data), help);
    case 'pattern':
      // Never echo what was written as password-env: it may be the password itself.
      if (at.endsWith('/password-env'))
        return problem(at, 'password-env must be the NAME of an environment variable, not the password', help);
      return problem(at, `${show(e.data)} is not in the expected form`, help);
    case 'minItems':
      return problem(at, `needs at least ${e.params.limit} entries`, help);
    case 'minLength':
      return problem(at, `must not be empty`, help);
    case 'uniqueItems':
      return problem(at, `has repeated entries`, 'list each value once');
    default:
      return problem(at, `${keyName(at)}: ${e.message ?? e.keyword}`, help);
  }
}

function describeRangeError(at: string, ps: Record<string, unknown>, v: number, help: string): ConfigProblem {
  if (ps.minimum === 0 && ps.maximum === 1) return problem(at, `probability expected 0–1, got ${v}`, probabilityFix(v));
  if (ps.exclusiveMinimum === 0 && ps.exclusiveMaximum === 100) {
    return problem(
      at,
      `percentile must be strictly between 0 and 100, got ${v}`,
      'use e.g. 90 for the 90th percentile, or an absolute { value, units } threshold',
    );
  }
  if (ps.exclusiveMinimum === 0 && ps.exclusiveMaximum === 1) {
    return problem(at, `${keyName(at)} must be strictly between 0 and 1, got ${v}`, 'write the ratio cost/loss as a fraction, e.g. 0.2');
  }
  const lo = ps.minimum ?? ps.exclusiveMinimum;
  const hi = ps.maximum ?? ps.exclusiveMaximum;
  const range = lo !== undefined && hi !== undefined ? `${lo}..${hi}` : lo !== undefined ? `at least ${lo}` : `at most ${hi}`;
  return problem(at, `${keyName(at)} must be ${range}, got ${v}`, help);
}
