#!/usr/bin/env node
// Bundles the TypeScript sources into one ES module with esbuild, so that the `forelight` command starts without
// compiling TypeScript on every run (through tsx: ~0.4 s, measured on the benchmark machine). Run by `npm ci`
// (the "prepare" script) and by bench/run-bench.ts:
//
//   node bin/build.mjs                          src/cli/main.ts → build/forelight.mjs
//   node bin/build.mjs ENTRY.ts OUT.mjs         any entry (the benchmark's)
//
// Packages stay imports from node_modules; src/read/hdf5-slice-worker.mjs is loaded by path at run time.
import { readdirSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');
export const CLI_BUNDLE = join(ROOT, 'build', 'forelight.mjs');

/** Bundles `entry` into `outfile` (ESM, Node 20, with a source map beside it for `node --enable-source-maps`). */
export async function buildBundle(entry = join(ROOT, 'src', 'cli', 'main.ts'), outfile = CLI_BUNDLE) {
  const { build } = await import('esbuild');
  await build({
    entryPoints: [entry], outfile, bundle: true, platform: 'node', format: 'esm', target: 'node20',
    packages: 'external', sourcemap: true, logLevel: 'warning',
  });
}

/** Newest modification time (ms) of the files under `dir`. */
function newestUnder(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestUnder(path) : statSync(path).mtimeMs);
  }
  return newest;
}

/** `bundle` when it exists and is newer than every file under `sourceDir`, else null (run the sources instead). */
export function freshBundle(bundle = CLI_BUNDLE, sourceDir = join(ROOT, 'src')) {
  let built;
  try {
    built = statSync(bundle).mtimeMs;
  } catch {
    return null;
  }
  return built >= newestUnder(sourceDir) ? bundle : null;
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const [entry, outfile] = process.argv.slice(2);
  await buildBundle(entry, outfile);
}
