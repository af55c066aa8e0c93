/**
 * Combination keys (src/core/keys.ts): one helper per kind, split back without loss, and the kinds do not mix
 * (checked by `tsc --noEmit`, which `npm test` runs). Ids follow the schema's `$defs/id` pattern, so '|' never
 * occurs inside one. Common practice, no source.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { eventKey, pairKey, pairOf, trackKey, tunedKey, type PairKey } from '../../src/core/keys.ts';

describe('combination keys', () => {
  it('pairOf gives back the region and indicator of pairKey', () => {
    expect(pairOf(pairKey('kessan-lowlands', 'heat-index'))).toEqual({ region: 'kessan-lowlands', indicator: 'heat-index' });
  });

  it('keys of one kind are equal exactly when their ids are', () => {
    expect(trackKey('r1', 'heat', 'weeks')).toBe(trackKey('r1', 'heat', 'weeks'));
    expect(
      new Set([
        trackKey('r1', 'heat', 'weeks'),
        trackKey('r1', 'heat', 'months'),
        eventKey('r1', 'heat', 'weeks', 1),
        eventKey('r1', 'heat', 'weeks', 2),
        tunedKey('r1', 'heat'),
      ]).size,
    ).toBe(5);
  });

  it('kinds do not mix (compile-time)', () => {
    // @ts-expect-error a track key is not a region × indicator key
    const wrong: PairKey = trackKey('r1', 'heat', 'weeks');
    // @ts-expect-error a plain string is not a key
    const plain: PairKey = 'r1|heat';
    expect([wrong, plain]).toHaveLength(2);
  });

  it('the configuration schema keeps "|" out of ids', () => {
    const schema = JSON.parse(readFileSync(new URL('../../config/forelight.schema.json', import.meta.url), 'utf8')) as {
      $defs: { id: { pattern: string } };
    };
    const id = new RegExp(schema.$defs.id.pattern);
    expect(id.test('kessan-lowlands')).toBe(true);
    expect(id.test('a|b')).toBe(false);
  });
});
