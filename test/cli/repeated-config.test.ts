/**
 * Repeated `--config` (run and serve issue several configurations together): the parser keeps every value in order
 * and refuses any other option given twice; the command refuses two configurations that would share a ledger
 * before anything is read (exit 64, EX_USAGE of BSD sysexits.h). Common practice, no source.
 */
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { parseArgs, stringOption, stringOptions } from '../../src/cli/args.ts';
import { EXIT } from '../../src/core/exit-codes.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const SPEC = { values: ['config', 'date'], flags: ['force'], repeatable: ['config'] };

describe('repeated --config', () => {
  it('keeps every --config in order (the last as the single value); any other option twice is a usage error', () => {
    const args = parseArgs(['run', '--config', 'a.yaml', '--config=b.yaml', '--date', '2026-11-26'], () => SPEC);
    expect(stringOptions(args, 'config')).toEqual(['a.yaml', 'b.yaml']);
    expect(stringOption(args, 'config')).toBe('b.yaml');
    expect(stringOptions(args, 'cluster')).toEqual([]);
    expect(() => parseArgs(['run', '--date', '2026-11-26', '--date', '2026-11-27'], () => SPEC)).toThrow(
      'option --date is given more than once',
    );
  });

  it('forelight run with the same configuration twice is refused naming the shared ledger; nothing is read', () => {
    const config = join(ROOT, 'config/forelight.yaml');
    const r = spawnSync(process.execPath, [join(ROOT, 'bin/forelight.mjs'), 'run', '--config', config, '--config', config], {
      cwd: ROOT,
      encoding: 'utf8',
      timeout: 120_000,
    });
    expect(r.status, r.stderr).toBe(EXIT.usage);
    expect(r.stderr).toMatch(
      new RegExp(`forelight: ${config} and ${config} both write the ledger .+ — give each configuration issued together its own ledger`),
    );
  });
});
