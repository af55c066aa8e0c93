/**
 * The Forelight package folder (package.json, config/, templates/, sample-inputs/), found by walking up from this
 * module, so that the same code finds its files when run from src/ through tsx and from the esbuild bundle in
 * build/ (bin/build.mjs).
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The `name` of a package.json (undefined when it has none). */
function manifestName(path: string): unknown {
  const manifest: unknown = JSON.parse(readFileSync(path, 'utf8'));
  return manifest !== null && typeof manifest === 'object' && 'name' in manifest ? manifest.name : undefined;
}

function findPackageRoot(from: string): string {
  for (let dir = from; ; dir = dirname(dir)) {
    const manifest = join(dir, 'package.json');
    if (existsSync(manifest) && manifestName(manifest) === 'forelight') return dir;
    if (dirname(dir) === dir) throw new Error(`no Forelight package.json above ${from}: reinstall Forelight (git clone, then npm ci)`);
  }
}

export const PACKAGE_ROOT = findPackageRoot(dirname(fileURLToPath(import.meta.url)));

/** Absolute path of `relative` (slash-separated) inside the package folder. */
export const packagePath = (relative: string): string => join(PACKAGE_ROOT, ...relative.split('/'));
