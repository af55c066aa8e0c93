/**
 * The classic and 64-bit-offset reader checked against a second, independent reader: netcdfjs 4 (cheminfo,
 * npm), which parses the same NetCDF Classic Format Specification (Unidata). Dimensions, variables, attributes
 * and every stored (raw, not yet CF-decoded) value of every variable must agree. netcdfjs cannot read CDF-5 or
 * offsets past 4 GiB, which is why Forelight has its own parser (see src/read/classic-header.ts).
 * Where the two disagree ncdump (netCDF-C) decides, in read-back.test.ts: netcdfjs 4 mis-steps record variables of
 * 1- and 2-byte types (it ignores their padding within a record) and cannot read a file whose only record variable
 * is unpadded (the spec's special case, fixture one-record-classic.nc); those are left out here.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { NetCDFReader } from 'netcdfjs';
import { describe, expect, it } from 'vitest';
import { openDataset } from '../../src/read/open-dataset.ts';

const DIR = join(import.meta.dirname, '../fixtures/netcdf');
const FILES = ['forecast-classic.nc', 'forecast-64bit.nc'];
const NARROW = new Set(['byte', 'ubyte', 'char', 'short', 'ushort']);

describe('classic reader agrees with netcdfjs (independent implementation of the Unidata classic format)', () => {
  for (const name of FILES) {
    it(`${name}: same dimensions, variables, attributes and raw values`, async () => {
      const reference = new NetCDFReader(readFileSync(join(DIR, name)));
      const ds = await openDataset(join(DIR, name));
      try {
        expect(ds.dimensions.map((d) => [d.name, d.unlimited ? reference.recordDimension.length : d.size])).toEqual(
          reference.dimensions.map((d, i) => [d.name, i === reference.recordDimension.id ? reference.recordDimension.length : d.size]),
        );
        expect(ds.variables.map((v) => v.name)).toEqual(reference.variables.map((v) => v.name));
        for (const ref of reference.variables) {
          const ours = ds.variable(ref.name);
          if (!ours) throw new Error(`variable ${ref.name} missing`);
          expect(ours.dimensions).toEqual(ref.dimensions.map((id) => reference.dimensions[id].name));
          for (const a of ref.attributes as { name: string; value: number | string }[]) {
            const mine = ours.attributes[a.name];
            if (typeof a.value === 'number') expect(Array.isArray(mine) ? mine[0] : mine).toBeCloseTo(a.value, 5);
            else expect(mine).toEqual(a.value);
          }
          if (ours.type === 'char' || (ref.record && NARROW.has(ours.type))) continue;
          const raw = await ds.readRaw(
            ref.name,
            ours.shape.map(() => 0),
            ours.shape,
          );
          const expected = (reference.getDataVariable(ref.name) as (number | number[])[]).flat();
          expect(raw.length).toBe(expected.length);
          raw.forEach((v, i) =>
            Number.isNaN(v) ? expect(Number.isNaN(expected[i])).toBe(true) : expect(v).toBeCloseTo(expected[i] as number, 4),
          );
        }
      } finally {
        await ds.close();
      }
    });
  }
});
