/**
 * Writes the invented Veloria sample scenario (the generator is src/sample/generate.ts).
 *
 *   npm run sample [-- --out DIR] [-- --seed N]
 */
import { resolve } from 'node:path';
import { generateSample } from '../src/sample/generate.ts';

const arg = (name: string): string | undefined => {
  const i = process.argv.indexOf(name);
  return i > 0 ? process.argv[i + 1] : undefined;
};
const out = arg('--out');
const seedText = arg('--seed');
if (seedText !== undefined && !/^\d+$/.test(seedText)) throw new RangeError(`--seed must be a non-negative integer, got '${seedText}'`);
const summary = await generateSample(out ? resolve(out) : undefined, {
  seed: seedText ? Number(seedText) : undefined,
  onProgress: (l) => process.stdout.write(`${l}\n`),
});
process.stdout.write(
  `${summary.files.length} files, ${(summary.totalBytes / 1e6).toFixed(1)} MB in ${summary.seconds.toFixed(1)} s → ${summary.outDir}\n`,
);
