/**
 * The diagnostic catalogue (src/core/diagnostic-codes.ts) against the sources and DEVELOPERS.md: every code
 * raised in src/ is listed, every listed code is raised somewhere, and the table in DEVELOPERS.md is the one
 * rendered from the catalogue. Common practice, no source. To refresh the table after editing the catalogue:
 * FORELIGHT_WRITE_DOCS=1 npx vitest run test/core/diagnostic-codes.test.ts
 */
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { DIAGNOSTIC_CODES, type CodeEntry } from '../../src/core/diagnostic-codes.ts';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const CATALOGUE = 'src/core/diagnostic-codes.ts';
const sources = readdirSync(join(ROOT, 'src'), { recursive: true, encoding: 'utf8' })
  .filter((f) => /\.(ts|mjs)$/.test(f))
  .map((f) => ({ file: `src/${f}`, text: readFileSync(join(ROOT, 'src', f), 'utf8') }))
  .filter((s) => s.file !== CATALOGUE);

/** Where code literals are passed: error constructors, diagnostic builders, config check tables, grid placing. */
const USES: readonly RegExp[] = [
  /new (?:ForelightError|InputError)\(\s*(?:'[a-z]+',\s*)?'([a-z0-9-]+)'/g,
  /\bdiagnostic\(\s*'([a-z0-9-]+)'/g,
  /\bdiagnosticOf\([^,()]+,\s*'([a-z0-9-]+)'/g,
  /\.place\(\s*'([a-z0-9-]+)'/g,
  /\[\s*'(config-[a-z0-9-]+)',/g,
  /super\(\s*'[a-z]+',\s*'([a-z0-9-]+)'/g,
  /\? '(delivery-[a-z]+)' : '(delivery-[a-z]+)'/g,
];

function usedCodes(): Map<string, string[]> {
  const used = new Map<string, string[]>();
  for (const { file, text } of sources) {
    for (const re of USES) {
      for (const m of text.matchAll(re)) {
        for (const code of m.slice(1).filter(Boolean)) used.set(code, [...(used.get(code) ?? []), file]);
      }
    }
  }
  return used;
}

const cell = (text: string) => text.replace(/\|/g, '\\|');

function renderCodeTable(): string {
  const rows = Object.entries(DIAGNOSTIC_CODES as Record<string, CodeEntry>).map(
    ([code, e]) => `| \`${code}\` | ${e.stage} | ${e.severity} | ${cell(e.meaning)} | ${cell(e.fix)} |`,
  );
  return ['| code | stage | severity | meaning | what to do |', '|---|---|---|---|---|', ...rows].join('\n');
}

const START = '<!-- diagnostic-codes:start (generated from src/core/diagnostic-codes.ts by test/core/diagnostic-codes.test.ts) -->';
const END = '<!-- diagnostic-codes:end -->';

describe('diagnostic catalogue', () => {
  it('finds the codes raised in src/ (the scan itself works: a known code of each kind is seen)', () => {
    const used = usedCodes();
    for (const code of [
      'input-truncated',
      'template',
      'config-rule',
      'config-grid',
      'hindcast-members',
      'unit',
      'delivery-temporary',
      'config-invalid',
    ])
      expect(used.has(code), code).toBe(true);
  });

  it('every code raised in src/ is in the catalogue', () => {
    const unknown = [...usedCodes()]
      .filter(([code]) => !Object.hasOwn(DIAGNOSTIC_CODES, code))
      .map(([code, files]) => `${code} (${files.join(', ')})`);
    expect(unknown).toEqual([]);
  });

  it('every code of the catalogue is raised somewhere in src/ (no dead entries)', () => {
    const all = sources.map((s) => s.text).join('\n');
    const dead = Object.keys(DIAGNOSTIC_CODES).filter((code) => !all.includes(`'${code}'`));
    expect(dead).toEqual([]);
  });

  it('every entry has a meaning and a fix', () => {
    for (const [code, e] of Object.entries(DIAGNOSTIC_CODES as Record<string, CodeEntry>)) {
      expect(e.meaning.length, code).toBeGreaterThan(10);
      expect(e.fix.length, code).toBeGreaterThan(5);
    }
  });

  it('DEVELOPERS.md holds the table rendered from the catalogue', () => {
    const path = join(ROOT, 'DEVELOPERS.md');
    const text = readFileSync(path, 'utf8');
    const a = text.indexOf(START);
    const b = text.indexOf(END);
    expect(a, 'DEVELOPERS.md lacks the diagnostic-codes markers').toBeGreaterThan(0);
    const current = text.slice(a + START.length, b).trim();
    const wanted = renderCodeTable();
    if (current !== wanted && process.env.FORELIGHT_WRITE_DOCS === '1')
      writeFileSync(path, `${text.slice(0, a + START.length)}\n${wanted}\n${text.slice(b)}`);
    else expect(current, 'the table is stale: run FORELIGHT_WRITE_DOCS=1 npx vitest run test/core/diagnostic-codes.test.ts').toBe(wanted);
  });
});
