/**
 * Rows read back from the ledger, checked instead of cast: each query declares the columns it selects with their
 * SQL types (as in migrations.ts) and a row that differs — a column absent, NULL where the schema says NOT NULL,
 * text where a number is stored, a status outside its set — is one `ledger-row` error naming the ledger, the
 * query and the column. Both databases give the same JavaScript values (pg-sync.ts: int8 as numbers, bytes as
 * Buffers), so one check serves SQLite and PostgreSQL.
 */
import { ForelightError } from '../core/errors.ts';

type BaseColumn = 'integer' | 'real' | 'text' | 'blob';
/** A column's SQL type; `?` when it may be NULL; a list of values for a text column holding one of them (null: may be NULL). */
export type Column = BaseColumn | `${BaseColumn}?` | readonly (string | null)[];

type BaseValue<K> = K extends 'integer' | 'real' ? number : K extends 'text' ? string : K extends 'blob' ? Uint8Array : never;
type ColumnValue<C> = C extends readonly (infer L)[] ? L : C extends `${infer K}?` ? BaseValue<K> | null : BaseValue<C>;
export type RowOf<S extends Record<string, Column>> = { readonly [K in keyof S]: ColumnValue<S[K]> };

/** The row type a reader gives. */
export type RowType<R> = R extends RowReader<infer T> ? T : never;

export interface RowReader<T> {
  /** The row `get()` returned, checked; undefined when there was none. */
  one(row: unknown, ledgerPath: string): T | undefined;
  /** The rows `all()` returned, each checked. */
  all(rows: readonly unknown[], ledgerPath: string): T[];
}

const FITS: Readonly<Record<string, (v: unknown) => boolean>> = {
  integer: (v) => Number.isInteger(v),
  real: (v) => typeof v === 'number',
  text: (v) => typeof v === 'string',
  blob: (v) => v instanceof Uint8Array,
};

/** Why `value` does not fit `spec`, or null when it does. */
function mismatch(spec: Column, value: unknown): string | null {
  if (typeof spec !== 'string')
    return spec.some((s) => s === value) ? null : `is ${String(JSON.stringify(value))}, not one of ${spec.map(String).join(', ')}`;
  const nullable = spec.endsWith('?');
  const base = nullable ? spec.slice(0, -1) : spec;
  if (value === null || value === undefined) return nullable && value === null ? null : `is ${value === null ? 'NULL' : 'absent'}`;
  const shown = typeof value === 'string' ? JSON.stringify(value.slice(0, 40)) : String(value).slice(0, 40);
  return FITS[base](value) ? null : `is ${typeof value} ${shown}, not ${base}`;
}

/** A reader of the rows of one query (`what` names it in errors, e.g. "runs"), from its columns' types. */
export function rowReader<const S extends Record<string, Column>>(what: string, columns: S): RowReader<RowOf<S>> {
  const check = (row: unknown, ledgerPath: string): RowOf<S> => {
    if (row === null || typeof row !== 'object')
      throw new ForelightError('ledger', 'ledger-row', `ledger ${ledgerPath}: a ${what} row is not a row`, 'inspect the ledger');
    for (const [column, spec] of Object.entries(columns)) {
      const why = mismatch(spec, Reflect.get(row, column));
      if (why)
        throw new ForelightError(
          'ledger',
          'ledger-row',
          `ledger ${ledgerPath}: ${what} row, column ${column} ${why}`,
          'inspect the ledger; it may have been edited by hand or written by another program',
        );
    }
    return row as RowOf<S>; // every declared column checked above
  };
  return {
    one: (row, ledgerPath) => (row === undefined ? undefined : check(row, ledgerPath)),
    all: (rows, ledgerPath) => rows.map((r) => check(r, ledgerPath)),
  };
}

/** Rows of a query selecting only a row id. */
export const idRows = rowReader('id', { id: 'integer' });

/** The id an `INSERT … RETURNING id` gave into `table` (an insert that returned nothing is a ledger error too). */
export function returnedId(table: string, row: unknown, ledgerPath: string): number {
  const got = idRows.one(row, ledgerPath);
  if (!got)
    throw new ForelightError('ledger', 'ledger-row', `ledger ${ledgerPath}: inserting into ${table} returned no id`, 'inspect the ledger');
  return got.id;
}
