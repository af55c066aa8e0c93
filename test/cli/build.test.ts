/**
 * The esbuild bundle the `forelight` command runs after `npm ci` (bin/build.mjs): used only while every source file
 * it was built from is unchanged, and it gives the same output as the TypeScript sources, including NetCDF-4 reads
 * on worker threads (the worker file is loaded by path from the package, not bundled).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
// @ts-expect-error -- plain JavaScript launcher helper without type declarations
import { buildBundle, freshBundle } from '../../bin/build.mjs';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const tmp = mkdtempSync(join(tmpdir(), 'forelight-build-'));
const bundleDir = join(ROOT, 'build', `test-${process.pid}`);
const bundle = join(bundleDir, 'forelight.mjs');
afterAll(() => {
  rmSync(tmp, { recursive: true, force: true });
  rmSync(bundleDir, { recursive: true, force: true });
});

describe('bin/build.mjs', () => {
  it('a bundle counts as fresh only while every input it lists has the same contents, whatever the file times', () => {
    const src = join(tmp, 'src');
    mkdirSync(join(src, 'read'), { recursive: true });
    const source = join(src, 'read', 'x.ts');
    const built = join(tmp, 'forelight.mjs');
    writeFileSync(source, 'export {};\n');
    expect(freshBundle(built, tmp)).toBeNull(); // not built yet
    writeFileSync(built, '// bundle\n');
    // The expected hash comes from GNU coreutils' sha256sum, not from the code under test.
    const hash = execFileSync('sha256sum', [source], { encoding: 'utf8' }).split(' ')[0];
    writeFileSync(`${built}.inputs.json`, JSON.stringify({ 'src/read/x.ts': hash }));
    expect(freshBundle(built, tmp)).toBe(built);
    utimesSync(source, new Date('2030-01-01T00:00:00Z'), new Date('2030-01-01T00:00:00Z')); // touched, not changed
    expect(freshBundle(built, tmp)).toBe(built);
    writeFileSync(source, 'export const edited = 1;\n');
    utimesSync(source, new Date('2020-01-01T00:00:00Z'), new Date('2020-01-01T00:00:00Z')); // older time, new contents
    expect(freshBundle(built, tmp)).toBeNull();
    rmSync(source);
    expect(freshBundle(built, tmp)).toBeNull(); // an input is gone
  });

  it('the inputs list of a real build names the entry, the sample generator the demo bundles, and this script', async () => {
    await buildBundle(join(ROOT, 'src', 'cli', 'main.ts'), bundle);
    const inputs = Object.keys(JSON.parse(readFileSync(`${bundle}.inputs.json`, 'utf8')) as Record<string, string>);
    expect(inputs).toEqual(
      expect.arrayContaining(['src/cli/main.ts', 'src/read/hdf5-slab.mjs', 'src/sample/generate.ts', 'bin/build.mjs']),
    );
    expect(inputs.some((p) => p.includes('node_modules'))).toBe(false);
    expect(freshBundle(bundle)).toBe(bundle);
  });

  it('the bundled CLI, started with a node flag workers reject (--input-type), prints the same extract JSON as the sources for a NetCDF-4 file read on worker threads', async () => {
    await buildBundle(join(ROOT, 'src', 'cli', 'main.ts'), bundle);
    const args = ['extract', join(ROOT, 'test/fixtures/netcdf/forecast-nc4.nc'), '--var', 't2m', '--box', '-90,90,-180,180', '--json'];
    const run = (command: string[], env: NodeJS.ProcessEnv) =>
      spawnSync(process.execPath, [...command, ...args], { cwd: tmp, encoding: 'utf8', timeout: 60_000, env: { ...process.env, ...env } });
    const runner = `import(${JSON.stringify(new URL(`file://${bundle}`).href)}).then(async (m) => { process.exitCode = await m.main(process.argv.slice(1)); })`;
    const fromBundle = run(['--input-type=module', '-e', runner], { FORELIGHT_READ_THREADS: '2' });
    const fromSource = run([join(ROOT, 'bin/forelight.mjs')], { FORELIGHT_FROM_SOURCE: '1', FORELIGHT_READ_THREADS: '0' });
    expect(fromBundle.stderr).toBe('');
    expect(fromBundle.status).toBe(0);
    expect(fromSource.status).toBe(0);
    expect(JSON.parse(fromBundle.stdout)).toEqual(JSON.parse(fromSource.stdout));
    expect(JSON.parse(fromBundle.stdout).members).toHaveLength(3); // forecast.cdl: number = 3
  }, 120_000);
});
