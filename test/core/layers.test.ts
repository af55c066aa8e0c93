/**
 * Every import points down (DEVELOPERS.md, "Rules of the house"): core ← indicators ← config ← read, ledger ←
 * calibrate ← decide ← render ← deliver ← schedule ← pipeline ← cluster ← cli. src/types.ts and the other boundary-type files directly in src/ sit with core; the
 * sample generator (src/sample) uses only core and is used only by the CLI. Imports are listed by TypeScript's
 * own scanner (ts.preProcessFile: static imports, type-only imports, re-exports and dynamic import()); a module
 * importing from its own folder is always allowed. Common practice, no source.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

const SRC = fileURLToPath(new URL('../../src/', import.meta.url));
const LEVEL: Readonly<Record<string, number>> = {
  core: 0,
  indicators: 1,
  sample: 1,
  config: 2,
  read: 3,
  ledger: 3,
  calibrate: 4,
  decide: 5,
  render: 6,
  deliver: 7,
  schedule: 8,
  pipeline: 9,
  cluster: 10,
  cli: 11,
};

const sources = readdirSync(SRC, { recursive: true, encoding: 'utf8' }).filter((f) => /\.(ts|mts|mjs)$/.test(f) && !f.endsWith('.d.mts'));
/** The layer folder of a path under src/ (the boundary types directly in src/, such as types.ts, belong to the ground floor). */
const folderOf = (file: string) => (file.includes('/') ? file.split('/')[0] : 'core');

/** "from → to" for every relative import of `file` that does not point down or sideways within its folder. */
function upwardImports(file: string, text = readFileSync(join(SRC, file), 'utf8')): string[] {
  const { importedFiles } = ts.preProcessFile(text, true, true);
  return importedFiles
    .map((i) => i.fileName)
    .filter((name) => name.startsWith('.'))
    .map((name) => relative(SRC, resolve(dirname(join(SRC, file)), name)))
    .filter((target) => {
      const [from, to] = [folderOf(file), folderOf(target)];
      if (from === to) return false;
      return target.startsWith('..') || !(to in LEVEL) || LEVEL[to] >= LEVEL[from];
    })
    .map((target) => `${file} → ${target}`);
}

describe('layering of src/', () => {
  it('every folder of src/ has a level', () => {
    expect(sources.length).toBeGreaterThan(100);
    expect([...new Set(sources.map(folderOf))].filter((f) => !(f in LEVEL))).toEqual([]);
  });

  it('no import points up, sideways into another folder of the same level, or outside src/', () => {
    expect(sources.flatMap((f) => upwardImports(f))).toEqual([]);
  });

  it('the check sees an upward, a sideways and an outside import, and lets a downward one pass', () => {
    const text = [
      "import { analyse } from '../pipeline/analyse.ts';",
      "import type { Ledger } from '../ledger/open-ledger.ts';",
      "const d = await import('../decide/diff.ts');",
      "import { x } from '../../sample-inputs/generate.ts';",
      "import { stageRank } from '../decide/types.ts';",
    ].join('\n');
    expect(upwardImports('read/example.ts', text)).toEqual([
      'read/example.ts → pipeline/analyse.ts',
      'read/example.ts → ledger/open-ledger.ts',
      'read/example.ts → decide/diff.ts',
      'read/example.ts → ../sample-inputs/generate.ts',
      'read/example.ts → decide/types.ts',
    ]);
    expect(upwardImports('render/example.ts', text)).toEqual([
      'render/example.ts → pipeline/analyse.ts',
      'render/example.ts → ../sample-inputs/generate.ts',
    ]);
  });
});
