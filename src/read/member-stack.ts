/**
 * Several files holding the members of one forecast (one file per member or per member group, as data portals
 * deliver them, and as GRIB files split per `perturbationNumber` come out of ecCodes) seen as ONE dataset:
 * every gridded variable gets the members of all parts along the ensemble dimension, in the order of the parts.
 * A part without an ensemble dimension counts as one member (a new dimension `member` is added). Every part must
 * have the same grid, times and gridded variables as the first; the first difference is an InputError naming the
 * part and the coordinate. Convention: common practice of portals, no source.
 */
import { InputError } from '../core/errors.ts';
import { findCoordinates } from './coordinates.ts';
import type { Dataset, DimensionInfo, VariableInfo } from './dataset.ts';
import { variableNotFound } from './dataset.ts';

/** Name of the ensemble dimension added when the parts have none. */
export const ADDED_MEMBER_DIMENSION = 'member';

interface Part {
  readonly ds: Dataset;
  /** Members in this part (1 when it has no ensemble dimension). */
  readonly members: number;
  /** Index of the first member of this part in the stacked dataset. */
  readonly first: number;
  /** False when this part has no ensemble dimension (one member): the member axis is left out of its reads. */
  readonly ownAxis: boolean;
}

function sameValues(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i] && !(a[i] !== a[i] && b[i] !== b[i])) return false;
  return true;
}

async function readWholeRaw(ds: Dataset, info: VariableInfo): Promise<Float64Array> {
  return ds.readRaw(
    info.name,
    info.shape.map(() => 0),
    info.shape,
  );
}

/** The member's own label (the ensemble coordinate, scalar or not), which differs from part to part by design. */
function labelsMember(v: VariableInfo, memberDim: string): boolean {
  return v.name === memberDim || v.attributes.standard_name === 'realization';
}

/**
 * Throws when `part` differs from `first` in a non-stacked variable's values or a stacked variable's shape (the
 * ensemble dimension left out: a part may hold one member without it).
 */
async function checkPart(first: Dataset, part: Dataset, stacked: ReadonlySet<string>, memberDim: string): Promise<void> {
  for (const v of first.variables) {
    if (labelsMember(v, memberDim)) continue;
    const other = part.variable(v.name);
    const differs = (what: string) =>
      new InputError(
        'members-differ',
        part.path,
        `${what} of '${v.name}' differs from ${first.path}`,
        'give every member file the same grid, times and variables (one forecast split by member)',
      );
    if (!other)
      throw new InputError(
        'members-differ',
        part.path,
        `has no variable '${v.name}', which ${first.path} has`,
        'give every member file the same variables',
      );
    const dims = (x: VariableInfo) =>
      x.dimensions
        .map((d, k) => `${d}=${x.shape[k]}`)
        .filter((_, k) => x.dimensions[k] !== memberDim)
        .join(',');
    if (dims(v) !== dims(other)) throw differs(`the shape (${other.dimensions.join(', ')})`);
    if (stacked.has(v.name)) continue;
    if (!sameValues(await readWholeRaw(first, v), await readWholeRaw(part, other))) throw differs('the values');
  }
}

/** Splits a hyperslab along the member axis over the parts and reassembles it in C order. */
async function readAcross(
  parts: readonly Part[],
  axis: number,
  start: readonly number[],
  count: readonly number[],
  read: (p: Part, start: number[], count: number[]) => Promise<Float64Array>,
): Promise<Float64Array> {
  const outer = count.slice(0, axis).reduce((a, b) => a * b, 1);
  const inner = count.slice(axis + 1).reduce((a, b) => a * b, 1);
  const total = count[axis];
  const out = new Float64Array(outer * total * inner);
  for (let j = 0; j < total; j++) {
    const member = start[axis] + j;
    const p = parts.find((q) => member >= q.first && member < q.first + q.members);
    if (!p) throw new RangeError(`member ${member} outside the stacked ensemble`);
    const s = [...start];
    const c = [...count];
    s[axis] = member - p.first;
    c[axis] = 1;
    const slab = await read(p, s, c);
    for (let o = 0; o < outer; o++) out.set(slab.subarray(o * inner, (o + 1) * inner), (o * total + j) * inner);
  }
  return out;
}

/**
 * The parts (already opened, in member order) as one dataset named `path`; closing it closes every part.
 * @throws InputError `members-differ` when a part's grid, times or variables differ from the first part's.
 */
export async function stackMembers(path: string, parts: readonly Dataset[]): Promise<Dataset> {
  const first = parts[0];
  const coords = await findCoordinates(first);
  let memberDim = coords.member?.dimension ?? null;
  for (const p of parts.slice(1)) memberDim ??= (await findCoordinates(p)).member?.dimension ?? null;
  const dimName = memberDim ?? ADDED_MEMBER_DIMENSION;
  const firstOwns = first.dimensions.some((d) => d.name === dimName);
  const gridded = (v: VariableInfo) => v.dimensions.includes(coords.grid.latName) && v.dimensions.includes(coords.grid.lonName);
  const stacked = new Set(first.variables.filter((v) => (firstOwns ? v.dimensions.includes(dimName) : gridded(v))).map((v) => v.name));
  for (const part of parts.slice(1)) await checkPart(first, part, stacked, dimName);
  let next = 0;
  const laid: Part[] = parts.map((ds) => {
    const own = ds.dimensions.find((d) => d.name === dimName);
    const p = { ds, members: own?.size ?? 1, first: next, ownAxis: own !== undefined };
    next += p.members;
    return p;
  });
  const total = next;
  const dimensions: DimensionInfo[] = firstOwns
    ? first.dimensions.map((d) => (d.name === dimName ? { ...d, size: total } : d))
    : [{ name: dimName, size: total, unlimited: false }, ...first.dimensions];
  const variables: VariableInfo[] = first.variables.map((v) => {
    if (!stacked.has(v.name)) return v;
    if (v.dimensions.includes(dimName)) return { ...v, shape: v.shape.map((n, k) => (v.dimensions[k] === dimName ? total : n)) };
    return { ...v, dimensions: [dimName, ...v.dimensions], shape: [total, ...v.shape] };
  });
  const byName = new Map(variables.map((v) => [v.name, v]));
  const infoOf = (name: string): VariableInfo => {
    const v = byName.get(name);
    if (!v) throw variableNotFound(path, name, variables);
    return v;
  };
  /** Member axis of a stacked variable as the stacked dataset shows it. */
  const memberAxisOf = (v: VariableInfo) => v.dimensions.indexOf(dimName);
  /** A part's own start/count: without the member axis when the part has none, else at the same place (refused otherwise). */
  const own = (p: Part, name: string, a: readonly number[], axis: number): number[] => {
    if (!p.ownAxis) return a.filter((_, k) => k !== axis);
    if (p.ds.variable(name)?.dimensions[axis] !== dimName)
      throw new InputError(
        'members-differ',
        p.ds.path,
        `'${name}' has its ensemble dimension '${dimName}' elsewhere than in ${first.path}`,
        'give every member file the same dimension order (ncpdq -a reorders)',
      );
    return [...a];
  };
  const readRaw = async (name: string, start: readonly number[], count: readonly number[]): Promise<Float64Array> => {
    const v = infoOf(name);
    if (!stacked.has(name)) return first.readRaw(name, start, count);
    const axis = memberAxisOf(v);
    return readAcross(laid, axis, start, count, (p, s, c) => p.ds.readRaw(name, own(p, name, s, axis), own(p, name, c, axis)));
  };
  return {
    path,
    format: first.format,
    dimensions,
    attributes: first.attributes,
    variables,
    variable: (name) => byName.get(name),
    readAhead: first.readAhead,
    readRaw,
    ...(parts.every((p) => p.readRawAt)
      ? {
          async readRawAt(name: string, start: readonly number[], count: readonly number[], positions: Int32Array) {
            const v = infoOf(name);
            if (!stacked.has(name)) return first.readRawAt!(name, start, count, positions);
            const axis = memberAxisOf(v);
            if (count[axis] !== 1) {
              const slab = await readRaw(name, start, count);
              return Float64Array.from(positions, (q) => slab[q]);
            }
            // One member: flat positions are the same with or without that size-1 axis.
            const p = laid.find((q) => start[axis] >= q.first && start[axis] < q.first + q.members) as Part;
            const s = [...start];
            s[axis] -= p.first;
            return p.ds.readRawAt!(name, own(p, name, s, axis), own(p, name, count, axis), positions);
          },
        }
      : {}),
    async close() {
      for (const p of parts) await p.close();
    },
  };
}
