/**
 * Dataset over a classic-family file (CDF-1, CDF-2, CDF-5): the header is parsed from a prefix, data
 * are read by positional reads of only the needed bytes (see classic-hyperslab.ts) into one reused
 * buffer and decoded big-endian. Offsets are JavaScript numbers, exact up to 2^53 bytes.
 */
import { readSync } from 'node:fs';
import type { FileHandle } from 'node:fs/promises';
import { InputError, errorMessage } from '../core/errors.ts';
import { variableNotFound, type Dataset, type DatasetFormat, type DimensionInfo, type VariableInfo } from './dataset.ts';
import { type ClassicHeader, type ClassicVariable, HeaderNeedsMoreBytes, parseClassicHeader } from './classic-header.ts';
import { decodeBigEndian } from './classic-values.ts';
import { PositionPicker } from './classic-pick.ts';
import { MAX_SPAN_BYTES, type ReadSpan, planReads, validateSelection } from './classic-hyperslab.ts';

const FIRST_PREFIX_BYTES = 64 * 1024;
const FORMATS: Record<number, DatasetFormat> = { 1: 'classic', 2: '64bit-offset', 5: 'cdf5' };

function truncated(file: string, expected: number, found: number): InputError {
  return new InputError('input-truncated', file, `file is truncated: expected ${expected} bytes, found ${found}`, 're-download it');
}

async function readExactly(handle: FileHandle, buf: Buffer, bytes: number, position: number): Promise<number> {
  let done = 0;
  while (done < bytes) {
    const { bytesRead } = await handle.read(buf, done, bytes - done, position + done);
    if (bytesRead === 0) break;
    done += bytesRead;
  }
  return done;
}

async function readHeader(file: string, handle: FileHandle, fileBytes: number): Promise<ClassicHeader> {
  for (let want = Math.min(FIRST_PREFIX_BYTES, fileBytes); ; want = Math.min(want * 4, fileBytes)) {
    const prefix = Buffer.alloc(want);
    await readExactly(handle, prefix, want, 0);
    try {
      return parseClassicHeader(prefix);
    } catch (err) {
      if (!(err instanceof HeaderNeedsMoreBytes)) {
        throw new InputError(
          'input-corrupt',
          file,
          `NetCDF classic header is malformed (${errorMessage(err)})`,
          're-download the file or check it with `ncdump -h`',
          { cause: err },
        );
      }
      if (want >= fileBytes) {
        throw new InputError(
          'input-truncated',
          file,
          `file is truncated: the NetCDF header continues past the end of the file (${fileBytes} bytes)`,
          're-download it',
        );
      }
    }
  }
}

class ClassicDataset implements Dataset {
  private readonly byName: Map<string, ClassicVariable>;
  private buffer = Buffer.allocUnsafeSlow(64 * 1024);
  /** readRaw calls run one after another: they share `buffer`. */
  private queue: Promise<unknown> = Promise.resolve();

  constructor(
    readonly path: string,
    readonly format: DatasetFormat,
    private readonly handle: FileHandle,
    private readonly header: ClassicHeader,
    readonly dimensions: readonly DimensionInfo[],
    readonly variables: readonly ClassicVariable[],
  ) {
    this.byName = new Map(variables.map((v) => [v.name, v]));
  }

  get attributes() {
    return this.header.attributes;
  }

  variable(name: string): VariableInfo | undefined {
    return this.byName.get(name);
  }

  readRaw(name: string, start: readonly number[], count: readonly number[]): Promise<Float64Array> {
    const run = this.queue.then(() => this.readNow(name, start, count));
    this.queue = run.catch(() => undefined);
    return run;
  }

  readRawAt(name: string, start: readonly number[], count: readonly number[], positions: Int32Array): Promise<Float64Array> {
    const run = this.queue.then(() => this.readNow(name, start, count, positions));
    this.queue = run.catch(() => undefined);
    return run;
  }

  /**
   * The hyperslab's values (C order), or only those at `positions` (flat indices into the hyperslab, any order;
   * the result follows `positions`). With positions, only the selected elements are decoded from the bytes read.
   */
  private async readNow(name: string, start: readonly number[], count: readonly number[], positions?: Int32Array): Promise<Float64Array> {
    const v = this.byName.get(name);
    if (!v) throw variableNotFound(this.path, name, this.variables);
    validateSelection(this.path, v, start, count);
    const strides = new Array<number>(v.shape.length);
    let stride = v.elementBytes;
    for (let d = v.shape.length - 1; d >= 0; d--) {
      strides[d] = d === 0 && v.isRecord ? this.header.recordBytes : stride;
      stride *= v.shape[d];
    }
    const plan = planReads(v.begin, strides, v.elementBytes, v.shape, start, count);
    const picker = positions ? new PositionPicker(positions, v.type, v.elementBytes) : null;
    const out = new Float64Array(picker ? positions!.length : plan.totalValues);
    let outPos = 0;
    for (const span of plan.spans) {
      if (span.bytes > MAX_SPAN_BYTES) {
        // One block bigger than the read size (a large contiguous slab): read it in pieces.
        for (let done = 0; done < span.bytes; done += MAX_SPAN_BYTES) {
          const piece = { offset: span.offset + done, bytes: Math.min(MAX_SPAN_BYTES, span.bytes - done), blockOffsets: [0] };
          this.readSpan(piece);
          const first = outPos + done / v.elementBytes;
          if (picker) picker.take(this.buffer, 0, first, piece.bytes / v.elementBytes, out);
          else decodeBigEndian(v.type, this.buffer, 0, piece.bytes / v.elementBytes, out, first);
        }
        outPos += plan.blockValues;
        continue;
      }
      this.readSpan(span);
      for (const blockOffset of span.blockOffsets) {
        if (picker) picker.take(this.buffer, blockOffset, outPos, plan.blockValues, out);
        else decodeBigEndian(v.type, this.buffer, blockOffset, plan.blockValues, out, outPos);
        outPos += plan.blockValues;
      }
    }
    return out;
  }

  /**
   * Reads the span's bytes into the reused buffer (growing it when needed). Synchronous positional reads: a box
   * needs thousands of small reads, and a thread-pool round trip per read cost more than the copy itself
   * (measured on the benchmark's 1.6 GB file).
   */
  private readSpan(span: ReadSpan): void {
    if (this.buffer.length < span.bytes) this.buffer = Buffer.allocUnsafeSlow(Math.max(span.bytes, this.buffer.length * 2));
    let got = 0;
    while (got < span.bytes) {
      const n = readSync(this.handle.fd, this.buffer, got, span.bytes - got, span.offset + got);
      if (n === 0) break;
      got += n;
    }
    if (got < span.bytes) throw truncated(this.path, span.offset + span.bytes, span.offset + got);
  }

  async close(): Promise<void> {
    await this.handle.close();
  }
}

/** Opens a classic-family file whose magic bytes were already checked; takes ownership of `handle`. */
export async function openClassicDataset(file: string, handle: FileHandle, fileBytes: number): Promise<Dataset> {
  const header = await readHeader(file, handle, fileBytes);
  let numRecords = header.numRecords;
  const firstRecord = Math.min(...header.variables.filter((v) => v.isRecord).map((v) => v.begin));
  if (numRecords < 0) numRecords = header.recordBytes > 0 ? Math.floor((fileBytes - firstRecord) / header.recordBytes) : 0;
  const dimensions = header.dimensions.map((d) => ({ name: d.name, size: d.unlimited ? numRecords : d.size, unlimited: d.unlimited }));
  const variables = header.variables.map((v) => ({ ...v, shape: v.isRecord ? [numRecords, ...v.shape.slice(1)] : v.shape }));
  let expected = 0;
  for (const v of variables) {
    const end = v.isRecord ? (numRecords === 0 ? 0 : v.begin + (numRecords - 1) * header.recordBytes + v.dataBytes) : v.begin + v.dataBytes;
    expected = Math.max(expected, end);
  }
  if (expected > fileBytes) throw truncated(file, expected, fileBytes);
  return new ClassicDataset(file, FORMATS[header.version], handle, header, dimensions, variables);
}
