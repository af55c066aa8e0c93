/**
 * Read planning for classic-family variables: turns a start/count box into few positional reads.
 * The innermost dimensions that are selected whole (and stored back to back) form one contiguous
 * block; nearby blocks are merged into one span so that, e.g., a 10×10 box from a wide grid is one read.
 */
import { InputError } from '../core/errors.ts';
import type { VariableInfo } from './dataset.ts';

/** Blocks closer than this many bytes are read together (reading the gap is cheaper than a syscall). */
const MERGE_GAP_BYTES = 64 * 1024;
/** Upper bound of one merged read; a single block larger than this is read in pieces of this size. */
export const MAX_SPAN_BYTES = 4 * 1024 * 1024;

export interface ReadSpan {
  readonly offset: number;
  readonly bytes: number;
  /** Byte offsets (within the span) of the blocks it holds, in output order. */
  readonly blockOffsets: readonly number[];
}

export interface ReadPlan {
  /** Values per contiguous block. */
  readonly blockValues: number;
  readonly spans: readonly ReadSpan[];
  readonly totalValues: number;
}

/** Throws InputError unless start/count is a valid box inside the variable's shape. */
export function validateSelection(file: string, info: VariableInfo, start: readonly number[], count: readonly number[]): number {
  const rank = info.shape.length;
  if (start.length !== rank || count.length !== rank) {
    throw new InputError(
      'read-selection',
      file,
      `variable '${info.name}' has ${rank} dimensions (${info.dimensions.join(', ')}) but start/count have ${start.length}/${count.length}`,
      'pass one start and one count per dimension',
    );
  }
  let total = 1;
  for (let d = 0; d < rank; d++) {
    const s = start[d];
    const n = count[d];
    if (!Number.isInteger(s) || !Number.isInteger(n) || s < 0 || n < 0 || s + n > info.shape[d]) {
      throw new InputError(
        'read-selection',
        file,
        `variable '${info.name}' dimension '${info.dimensions[d]}' has size ${info.shape[d]} but the read asks for ${n} values from index ${s}`,
        'check the region box and the lead/member ranges against the file',
      );
    }
    total *= n;
  }
  return total;
}

/**
 * Plans reads of the box. `strides[d]` is the byte distance between consecutive indices of dimension d
 * (for record variables, stride 0 is the record size); `begin` is the byte offset of index 0.
 */
export function planReads(
  begin: number,
  strides: readonly number[],
  elementBytes: number,
  shape: readonly number[],
  start: readonly number[],
  count: readonly number[],
): ReadPlan {
  const rank = shape.length;
  let totalValues = 1;
  for (const n of count) totalValues *= n;
  if (totalValues === 0) return { blockValues: 0, spans: [], totalValues: 0 };
  // inner[d]: values under one index of dim d; dim d is "packed" when its stride is exactly that.
  const inner = new Array<number>(rank);
  for (let d = rank - 1, n = 1; d >= 0; d--) {
    inner[d] = n;
    n *= shape[d];
  }
  const packed = (d: number): boolean => strides[d] === inner[d] * elementBytes;
  // Grow the contiguous block outwards while the inner dimensions are selected whole.
  let m = Math.max(rank - 1, 0);
  while (m > 0 && count[m] === shape[m] && packed(m - 1)) m--;
  // A record dimension is not packed (records interleave): then the block is one record's slab.
  const outerDims = rank > 0 && !packed(m) ? m + 1 : m;
  const blockValues = rank === 0 ? 1 : outerDims > m ? inner[m] : count[m] * inner[m];
  const blockBytes = blockValues * elementBytes;
  let base = begin;
  for (let d = 0; d < rank; d++) base += start[d] * strides[d];

  const spans: ReadSpan[] = [];
  let spanStart = -1;
  let spanEnd = -1;
  let blocks: number[] = [];
  const flush = (): void => {
    if (spanStart >= 0) spans.push({ offset: spanStart, bytes: spanEnd - spanStart, blockOffsets: blocks });
  };
  const outer = new Array<number>(outerDims).fill(0);
  for (;;) {
    let offset = base;
    for (let d = 0; d < outerDims; d++) offset += outer[d] * strides[d];
    const end = offset + blockBytes;
    if (spanStart >= 0 && offset - spanEnd <= MERGE_GAP_BYTES && end - spanStart <= MAX_SPAN_BYTES) {
      blocks.push(offset - spanStart);
      spanEnd = end;
    } else {
      flush();
      spanStart = offset;
      spanEnd = end;
      blocks = [0];
    }
    let d = outerDims - 1;
    while (d >= 0 && ++outer[d] === count[d]) outer[d--] = 0;
    if (d < 0) break;
  }
  flush();
  return { blockValues, spans, totalValues };
}
