#!/usr/bin/env node
// Bundles the TypeScript sources into one ES module with esbuild, so that the `forelight` command starts without
// compiling TypeScript on every run (through tsx: ~0.4 s, measured on the benchmark machine). Run by `npm ci`
// (the "prepare" script) and by bench/run-bench.ts:
//
//   node bin/build.mjs                          src/cli/main.ts → build/forelight.mjs
//   node bin/build.mjs ENTRY.ts OUT.mjs         any entry (the benchmark's)
//
// Beside the bundle, OUT.inputs.json lists the sha256 of every source file that went into it (and of this script),
// so that a bundle is used only while all of them are unchanged. Packages stay imports from node_modules;
// src/read/hdf5-slice-worker.mjs is loaded by path at run time.
import { createHash } from 'node:crypto';
import { readFileSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');
export const CLI_BUNDLE = join(ROOT, 'build', 'forelight.mjs');
const THIS_SCRIPT = relative(ROOT, fileURLToPath(import.meta.url));

const sha256 = (path) => createHash('sha256').update(readFileSync(path)).digest('hex');
const inputsFile = (bundle) => `${bundle}.inputs.json`;

/** Bundles `entry` into `outfile` (ESM, Node 20, with a source map beside it for `node --enable-source-maps`). */
export async function buildBundle(entry = join(ROOT, 'src', 'cli', 'main.ts'), outfile = CLI_BUNDLE) {
  const { build } = await import('esbuild');
  const result = await build({
    entryPoints: [entry],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    sourcemap: true,
    metafile: true,
    absWorkingDir: ROOT,
    logLevel: 'warning',
  });
  const inputs = [...Object.keys(result.metafile.inputs), THIS_SCRIPT].sort();
  writeFileSync(inputsFile(outfile), `${JSON.stringify(Object.fromEntries(inputs.map((p) => [p, sha256(join(ROOT, p))])), null, 1)}\n`);
}

/**
 * `bundle` when it was built from exactly the sources now on disk (every input listed beside it has the same
 * sha256, a few milliseconds for the whole tree), else null: run the sources instead.
 */
export function freshBundle(bundle = CLI_BUNDLE, root = ROOT) {
  try {
    const inputs = JSON.parse(readFileSync(inputsFile(bundle), 'utf8'));
    statSync(bundle); // the bundle itself must exist
    return Object.entries(inputs).every(([path, hash]) => sha256(join(root, path)) === hash) ? bundle : null;
  } catch {
    return null; // not built, or an input is gone
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const [entry, outfile] = process.argv.slice(2);
  await buildBundle(entry, outfile);
}
