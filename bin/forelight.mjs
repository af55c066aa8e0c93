#!/usr/bin/env node
// The `forelight` command. Runs build/forelight.mjs (made by `npm ci`, see bin/build.mjs) while every source file it
// was built from is unchanged (sha256); otherwise, e.g. in a tree a developer has just edited, or with
// FORELIGHT_FROM_SOURCE=1, the TypeScript sources through tsx.
import { pathToFileURL } from 'node:url';
import { freshBundle } from './build.mjs';

const fromSource = !['', '0', undefined].includes(process.env.FORELIGHT_FROM_SOURCE?.trim());
const bundle = fromSource ? null : freshBundle();
let main;
if (bundle) {
  ({ main } = await import(pathToFileURL(bundle).href));
} else {
  (await import('tsx/esm/api')).register();
  ({ main } = await import('../src/cli/main.ts'));
}
process.exitCode = await main(process.argv.slice(2));
