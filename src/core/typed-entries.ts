/** The set entries of a record keyed by a string union, keys kept as that union and unset (undefined) values left out. */
export function entriesOf<K extends string, V>(record: Readonly<Partial<Record<K, V>>>): [K, V][] {
  // Object.entries types every key as string; the keys of a Record<K, …> are K by its type.
  return (Object.entries(record) as [K, V | undefined][]).filter((e): e is [K, V] => e[1] !== undefined);
}
