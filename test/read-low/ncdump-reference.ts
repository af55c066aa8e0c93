/**
 * Reference values from ncdump (netCDF-C, Unidata): `ncdump -v <var> -p 9,17 <file>` prints every stored
 * value with 9 significant digits for floats and 17 for doubles (enough to identify the binary value);
 * `_` marks a value equal to the fill value. Run at test time (ncdump is installed in CI).
 */
import { execFileSync } from 'node:child_process';

/** Stored values of `variable` in C order; null where ncdump prints `_` (fill). */
export function ncdumpValues(file: string, variable: string): (number | null)[] {
  const text = execFileSync('ncdump', ['-v', variable, '-p', '9,17', file], { encoding: 'utf8' });
  const data = text.slice(text.indexOf('\ndata:'));
  const match = new RegExp(`\\n ${variable} =([^;]*);`).exec(data);
  if (!match) throw new Error(`ncdump printed no data for ${variable} in ${file}`);
  return match[1]
    .split(',')
    .map((s) => s.trim())
    .map((s) => (s === '_' ? null : Number(s)));
}

/** The stored value ncdump's `_` stands for: the _FillValue attribute or netCDF-C's default. */
export function ncdumpFill(attributes: Readonly<Record<string, unknown>>, defaultFill: number): number {
  const f = attributes._FillValue;
  return typeof f === 'number' ? f : defaultFill;
}
