#!/usr/bin/env node
// The `forelight` command: loads the TypeScript CLI through tsx (no build step needed).
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../src/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
