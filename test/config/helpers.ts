/** Test helpers: fixture paths and one-change variants of minimal.yaml written to a temporary folder. */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const FIXTURES = fileURLToPath(new URL('./fixtures/', import.meta.url));
export const fixture = (name: string) => join(FIXTURES, name);

const tmp = mkdtempSync(join(tmpdir(), 'forelight-config-'));
let n = 0;

/** minimal.yaml with `find` replaced by `replace` (which must occur exactly once), written to a temp file. */
export function minimalVariant(find: string, replace: string): string {
  const text = readFileSync(fixture('minimal.yaml'), 'utf8');
  if (text.split(find).length !== 2) throw new Error(`"${find}" must occur exactly once in minimal.yaml`);
  const file = join(tmp, `variant-${++n}.yaml`);
  writeFileSync(file, text.replace(find, replace));
  return file;
}

export function writeTemp(name: string, content: string | Buffer): string {
  const file = join(tmp, name);
  writeFileSync(file, content);
  return file;
}
