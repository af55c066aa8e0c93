/**
 * `toToken` as a path part: Node's own path.resolve (POSIX normalisation of `.` and `..`) must keep every token inside
 * its folder, however the run id or team name is spelt.
 */
import { relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { toToken } from '../../src/render/safe-text.ts';

describe('toToken', () => {
  it('never yields `.`, `..` or a hidden name, so a token stays inside its folder', () => {
    const root = '/srv/archive';
    for (const hostile of ['..', '.', '../../etc/passwd', '.hidden', '...', '-..-', '. .', '..\\..\\x', '2026-11-26-4']) {
      const token = toToken(hostile);
      expect(token.startsWith('.')).toBe(false);
      if (token === '') continue;
      const rel = relative(root, resolve(root, token));
      expect(rel === token && !rel.startsWith('..')).toBe(true);
    }
    expect(toToken('..')).toBe('');
    expect(toToken('../../etc/passwd')).toBe('etc-passwd');
    expect(toToken('2026-11-26-4')).toBe('2026-11-26-4');
  });
});
