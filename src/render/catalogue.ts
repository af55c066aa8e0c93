/**
 * Message catalogues: every sentence Forelight prints, one YAML file per language (`templates/messages/<locale>.yaml`),
 * each value an ICU MessageFormat string (compiled with @messageformat/core; plural, select and `{arg}` slots).
 * Templates are shared by all languages and call `t(key, args)`; nothing in a template or in code is a sentence.
 *
 * An operator's `templates:` folder may hold `messages/<locale>.yaml` too: its keys override the shipped ones,
 * and a new language is a new file with every key of the English one (`missingKeys` says which are absent).
 * Output goes through the locale's typography (`typography.ts`).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import MessageFormatModule from '@messageformat/core';
import { parseDocument } from 'yaml';
import { ForelightError, errorMessage } from '../core/errors.ts';
import { packagePath } from '../core/package-root.ts';
import { applyTypography } from './typography.ts';
import { isRecord } from '../core/json-shape.ts';

// The package is CommonJS (`module.exports = MessageFormat`) while its typings declare an ES default export.
const MessageFormat = MessageFormatModule as unknown as typeof MessageFormatModule.default;

export type MessageArgs = Readonly<Record<string, unknown>>;
/** One language's messages: `t('key', { arg: value })`. */
export type Translate = (key: string, args?: MessageArgs) => string;

export interface Catalogue {
  /** Translator for a locale; throws a one-line error naming the locale when it has no catalogue. */
  readonly forLocale: (locale: string) => Translate;
  /** Keys of a locale's catalogue. */
  readonly keys: (locale: string) => readonly string[];
}

/** Shipped catalogue folder. */
export const SHIPPED_MESSAGES = packagePath('templates/messages');

/** Key → message of one YAML file (flat mapping of strings); a bad file is a one-line error with line:column. */
export function readMessages(file: string): Map<string, string> {
  const doc = parseDocument(readFileSync(file, 'utf8'), { prettyErrors: false });
  if (doc.errors.length > 0) {
    const e = doc.errors[0];
    throw new ForelightError(
      'render',
      'catalogue',
      `${file}:${e.linePos?.[0].line ?? 0}:${e.linePos?.[0].col ?? 0}: ${e.message.split('\n')[0]}`,
      'fix the YAML of the message catalogue',
    );
  }
  const raw: unknown = doc.toJS();
  if (!isRecord(raw)) {
    throw new ForelightError('render', 'catalogue', `${file} is not a mapping of message keys to texts`, 'write one "key: text" per line');
  }
  const out = new Map<string, string>();
  for (const [k, v] of Object.entries(raw)) {
    if (typeof v !== 'string') throw new ForelightError('render', 'catalogue', `${file}: message ${k} is not a text`, 'quote the message');
    out.set(k, v);
  }
  return out;
}

/** Catalogues from the shipped folder, overridden key by key by `<overrideDir>/messages/<locale>.yaml`. */
export function loadCatalogue(overrideDir = ''): Catalogue {
  const cache = new Map<string, { keys: string[]; translate: Translate }>();
  const load = (locale: string) => {
    const hit = cache.get(locale);
    if (hit) return hit;
    const files = [
      join(SHIPPED_MESSAGES, `${locale}.yaml`),
      ...(overrideDir ? [join(overrideDir, 'messages', `${locale}.yaml`)] : []),
    ].filter((f) => existsSync(f));
    if (files.length === 0) {
      throw new ForelightError(
        'render',
        'no-catalogue',
        `no message catalogue for locale "${locale}" (looked for messages/${locale}.yaml)`,
        `copy templates/messages/en.yaml to messages/${locale}.yaml in the templates folder and translate every message`,
      );
    }
    const messages = new Map<string, string>();
    for (const f of files) for (const [k, v] of readMessages(f)) messages.set(k, v);
    const mf = new MessageFormat(locale === 'en' ? 'en' : locale);
    const compiled = new Map<string, (args: MessageArgs) => string>();
    const translate: Translate = (key, args = {}) => {
      let fn = compiled.get(key);
      if (!fn) {
        const source = messages.get(key);
        if (source === undefined) {
          throw new ForelightError(
            'render',
            'missing-message',
            `message "${key}" is missing from the ${locale} catalogue (${files.join(', ')})`,
            `add "${key}:" to messages/${locale}.yaml`,
          );
        }
        try {
          fn = mf.compile(source) as (args: MessageArgs) => string;
        } catch (err) {
          throw new ForelightError(
            'render',
            'bad-message',
            `message "${key}" of the ${locale} catalogue does not parse: ${errorMessage(err).split('\n')[0]}`,
            'fix its ICU MessageFormat syntax (braces, plural and select cases)',
            { cause: err },
          );
        }
        compiled.set(key, fn);
      }
      return applyTypography(locale, fn(args));
    };
    const entry = { keys: [...messages.keys()], translate };
    cache.set(locale, entry);
    return entry;
  };
  return { forLocale: (locale) => load(locale).translate, keys: (locale) => load(locale).keys };
}

/** Keys of `reference` (English by default) that `locale` lacks. */
export function missingKeys(catalogue: Catalogue, locale: string, reference = 'en'): string[] {
  const have = new Set(catalogue.keys(locale));
  return catalogue.keys(reference).filter((k) => !have.has(k));
}
