#!/usr/bin/env node
// Runs a TypeScript entry file through tsx's ESM loader: `node bin/run-ts.mjs path/to/file.ts [args]`.
import { register } from 'tsx/esm/api';
import { pathToFileURL } from 'node:url';
import { resolve } from 'node:path';

register();
const [entry, ...rest] = process.argv.slice(2);
if (!entry) {
  process.stderr.write('usage: node bin/run-ts.mjs <file.ts> [args]\n');
  process.exit(2);
}
process.argv = [process.argv[0], resolve(entry), ...rest];
await import(pathToFileURL(resolve(entry)).href);
