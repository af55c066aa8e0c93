/**
 * Locates installed packages' ES-module entry files on disk, for the HDF5 reader's two loading tricks:
 * h5wasm is loaded with require(), in the main thread and in the NetCDF-4 read workers (hdf5-slice-pool.ts).
 */
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { jsonShape, parseShaped } from '../core/json-shape.ts';

type ExportTarget = string | { import?: string | { default: string }; default?: string };

/** The `exports` map of a package.json (Node.js "Packages" documentation, conditional exports), as read here. */
const isManifest = jsonShape<{ exports: Record<string, ExportTarget> }>({
  type: 'object',
  properties: {
    exports: {
      type: 'object',
      additionalProperties: {
        anyOf: [
          { type: 'string' },
          {
            type: 'object',
            properties: {
              import: {
                anyOf: [{ type: 'string' }, { type: 'object', properties: { default: { type: 'string' } }, required: ['default'] }],
              },
              default: { type: 'string' },
            },
          },
        ],
      },
    },
  },
  required: ['exports'],
});

/** Absolute path of `name`'s export `subpath` (its "import" condition); reads package.json directly,
 * since some packages (h5wasm) do not export it. */
export function packageExportPath(name: string, subpath: string): string {
  const roots = createRequire(import.meta.url).resolve.paths(name) ?? [];
  const pkgPath = roots.map((r) => join(r, name, 'package.json')).find((p) => existsSync(p));
  if (!pkgPath) throw new Error(`package ${name} is not installed (run npm ci)`);
  const pkg = parseShaped(readFileSync(pkgPath, 'utf8'), isManifest);
  if (!pkg.ok) throw new Error(`${pkgPath} has no usable "exports" (${pkg.why}): reinstall it (npm ci)`);
  const entry = pkg.value.exports[subpath];
  const target = typeof entry === 'string' ? entry : (entry?.import ?? entry?.default);
  const file = typeof target === 'string' ? target : target?.default;
  if (!file) throw new Error(`package ${name} has no import export '${subpath}'`);
  return join(dirname(pkgPath), file);
}
