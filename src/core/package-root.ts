/**
 * The Forelight package folder (package.json, config/, templates/, sample-inputs/), found by walking up from this
 * module, so that the same code finds its files when run from src/ through tsx and from the esbuild bundle in
 * build/ (bin/build.mjs).
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

function findPackageRoot(from: string): string {
  for (let dir = from; ; dir = dirname(dir)) {
    const manifest = join(dir, 'package.json');
    if (existsSync(manifest) && (JSON.parse(readFileSync(manifest, 'utf8')) as { name?: string }).name === 'forelight') return dir;
    if (dirname(dir) === dir) throw new Error(`no Forelight package.json above ${from}: reinstall Forelight (git clone, then npm ci)`);
  }
}

export const PACKAGE_ROOT = findPackageRoot(dirname(fileURLToPath(import.meta.url)));

/** Absolute path of `relative` (slash-separated) inside the package folder. */
export const packagePath = (relative: string): string => join(PACKAGE_ROOT, ...relative.split('/'));
