/**
 * Long CSV captures read on both cores: the parser threads (csvChunkWorker.ts) start while the start of the file is
 * sniffed here (app/formats/csvSniff.ts); then runs of whole lines (1 MiB first, then 4 MiB) go to the threads and
 * come back as column arrays, in file order, into the same block builder the streaming reader uses. Same samples,
 * same blocks, same messages with the same line numbers as createCsvReader; memory stays a few chunks in flight
 * however long the file.
 */
import { open, type FileHandle } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { InputError } from '../../app/errors';
import type { SampleBlock } from '../../app/capture/samples';
import { defaultBlockSamples } from '../../app/formats/captureReader';
import type { CsvChunkColumns, CsvChunkFailure } from '../../app/formats/csvChunk';
import type { CsvLayout } from '../../app/formats/csvLayout';
import { csvSniffBytes, layoutFromStart, rowPlanOf } from '../../app/formats/csvReader';
import { maxLineBytes } from '../../app/formats/lineSplitter';
import { SampleBlockBuilder } from '../../app/formats/sampleBlockBuilder';
import { startsWithByteOrderMark } from '../../app/formats/utf8';
import type { ChunkPlan, ChunkRecycle, ChunkRequest } from './csvChunkWorker';
import { packageRoot } from '../session/packagePaths';
import { loadCsvFieldsModule } from './csvFieldsWasm';
import { CaptureCancelled, type OpenedCapture } from './openedCapture';
import type { ReadCaptureOptions } from './readCaptureFile';

export interface ParallelCsvOptions {
  /** Parser threads (default: 2, or 1 on a single core). */
  threads?: number;
  /** Bytes per run of lines sent to a thread (default 4 MiB). */
  chunkBytes?: number;
}

interface ChunkAnswer {
  id: number;
  buffer: ArrayBuffer;
  columns?: CsvChunkColumns;
  failure?: CsvChunkFailure;
}

/**
 * The worker: built, dist/csvChunkWorker.js (this code may sit in a chunk or in the Electron bundle, so the file is
 * found from the package's root); from source (tsx, the tests), the .ts beside this module through tsx's require
 * hook (a worker takes no --import flag).
 */
function startWorker(fields: WebAssembly.Module | null): Worker {
  const workerData = { fields };
  if (import.meta.url.endsWith('.ts')) {
    const source = fileURLToPath(new URL('./csvChunkWorker.ts', import.meta.url));
    return new Worker(`require('tsx/cjs'); require(${JSON.stringify(source)});`, { eval: true, workerData });
  }
  return new Worker(join(packageRoot(), 'dist', 'csvChunkWorker.js'), { workerData });
}

/** Byte offset where line `lineNumber` (1-based) starts in `bytes`, or -1 when the bytes end first. */
function lineStartOffset(bytes: Uint8Array, lineNumber: number): number {
  let offset = 0;
  for (let line = 1; line < lineNumber; line++) {
    const newline = bytes.indexOf(0x0a, offset);
    if (newline < 0) return -1;
    offset = newline + 1;
  }
  return offset;
}

async function readAt(handle: FileHandle, target: Uint8Array, offset: number, length: number, position: number): Promise<number> {
  let done = 0;
  while (done < length) {
    const { bytesRead } = await handle.read(target, offset + done, length - done, position + done);
    if (bytesRead === 0) break;
    done += bytesRead;
  }
  return done;
}

export async function openParallelCsv(path: string, totalBytes: number, options: Omit<ReadCaptureOptions, 'chunkBytes'> & ParallelCsvOptions): Promise<OpenedCapture> {
  // The threads start first: a thread takes tens of milliseconds to come up, the file's start is sniffed meanwhile.
  // The WebAssembly reader is compiled once here and shared (each thread gives it a memory of its own).
  const threads = Math.max(1, options.threads ?? Math.min(2, availableParallelism()));
  const fields = loadCsvFieldsModule();
  const workers = Array.from({ length: threads }, () => startWorker(fields));
  // A thread that fails while the file is sniffed: kept for the reading to report (an 'error' with no listener would
  // end the process).
  const startFailure: { error: unknown } = { error: null };
  for (const worker of workers) worker.on('error', (error) => (startFailure.error ??= error));
  let handle: FileHandle | null = null;
  let layout: CsvLayout;
  let dataStart: number;
  try {
    handle = await open(path, 'r');
    const head = new Uint8Array(Math.min(totalBytes, csvSniffBytes));
    const headLength = await readAt(handle, head, 0, head.length, 0);
    const complete = headLength >= totalBytes;
    layout = layoutFromStart(head.subarray(0, headLength), complete, options, path);
    dataStart = lineStartOffset(head, layout.dialect.firstDataLine);
    if (dataStart < 0) throw new InputError('the file has a header but no samples', path);
    if (dataStart === 0 && startsWithByteOrderMark(head, 0, headLength)) dataStart = 3;
  } catch (error) {
    await Promise.all(workers.map((worker) => worker.terminate()));
    await handle?.close();
    throw error;
  }
  const plan: ChunkPlan = { plan: rowPlanOf(layout) };
  for (const worker of workers) worker.postMessage(plan);
  return { blocks: parallelBlocks(path, handle, workers, startFailure, layout, dataStart, totalBytes, options), readAs: () => layout.readAs, totalBytes };
}

async function* parallelBlocks(path: string, handle: FileHandle, workers: Worker[], startFailure: { error: unknown }, layout: CsvLayout, dataStart: number, totalBytes: number, options: Omit<ReadCaptureOptions, 'chunkBytes'> & ParallelCsvOptions): AsyncGenerator<SampleBlock> {
  const chunkBytes = Math.max(64, options.chunkBytes ?? 4 << 20);
  // The first run is short, so the analysis starts while the threads warm up on the next ones.
  const firstChunkBytes = Math.min(chunkBytes, 1 << 20);
  const waiting = new Map<number, { resolve: (answer: ChunkAnswer) => void; reject: (error: unknown) => void }>();
  let crashed: unknown = startFailure.error;
  for (const worker of workers) {
    worker.on('message', (answer: ChunkAnswer) => {
      const entry = waiting.get(answer.id);
      waiting.delete(answer.id);
      entry?.resolve(answer);
    });
    worker.on('error', (error) => {
      crashed ??= error;
      for (const entry of waiting.values()) entry.reject(error);
      waiting.clear();
    });
  }
  let currentLine = layout.dialect.firstDataLine;
  const where = (): string => `${path}, line ${currentLine}`;
  const builder = new SampleBlockBuilder({
    blockSamples: options.blockSamples ?? defaultBlockSamples,
    hasControl: layout.hasControl,
    fixedRateHz: layout.fixedRateHz,
    fallbackRateHz: options.sampleRateHz,
    where,
  });
  const spare: ArrayBuffer[] = [];
  let carry = new Uint8Array(0);
  let position = dataStart;
  let nextId = 0;
  let consumedBytes = dataStart;
  const inFlight: { id: number; endOffset: number; answer: Promise<ChunkAnswer> }[] = [];

  /** The next run of whole lines (with what was left of the last line before it), or null at the end of the file. */
  const nextChunk = async (): Promise<{ buffer: ArrayBuffer; length: number; endOffset: number } | null> => {
    if (position >= totalBytes && carry.length === 0) return null;
    const buffer = spare.pop() ?? new ArrayBuffer(chunkBytes + maxLineBytes);
    const bytes = new Uint8Array(buffer);
    bytes.set(carry, 0);
    const room = Math.min(nextId === 0 ? firstChunkBytes : chunkBytes, totalBytes - position);
    const got = await readAt(handle, bytes, carry.length, room, position);
    position += got;
    let length = carry.length + got;
    if (position < totalBytes) {
      const lastNewline = bytes.lastIndexOf(0x0a, length - 1);
      if (lastNewline < 0) {
        if (length > maxLineBytes) throw new InputError(`a line is longer than ${maxLineBytes} bytes: not a capture file?`, path);
        carry = bytes.slice(0, length);
        spare.push(buffer);
        return nextChunk();
      }
      carry = bytes.slice(lastNewline + 1, length);
      if (carry.length > maxLineBytes) throw new InputError(`a line is longer than ${maxLineBytes} bytes: not a capture file?`, path);
      length = lastNewline + 1;
    } else {
      carry = new Uint8Array(0);
    }
    return { buffer, length, endOffset: position - carry.length };
  };

  const send = (chunk: { buffer: ArrayBuffer; length: number; endOffset: number }): void => {
    const id = nextId++;
    const worker = workers[id % workers.length];
    const answer = new Promise<ChunkAnswer>((resolve, reject) => {
      if (crashed) reject(crashed);
      else waiting.set(id, { resolve, reject });
    });
    const request: ChunkRequest = { id, buffer: chunk.buffer, length: chunk.length };
    worker.postMessage(request, [chunk.buffer]);
    inFlight.push({ id, endOffset: chunk.endOffset, answer });
  };

  try {
    let ended = false;
    for (;;) {
      while (!ended && inFlight.length < 2 * workers.length) {
        if (options.signal?.aborted) throw new CaptureCancelled(path);
        const chunk = await nextChunk();
        if (chunk === null) ended = true;
        else send(chunk);
      }
      const next = inFlight.shift();
      if (next === undefined) break;
      const answer = await next.answer;
      if (options.signal?.aborted) throw new CaptureCancelled(path);
      spare.push(answer.buffer);
      if (answer.failure) {
        throw new InputError(answer.failure.message, `${path}, line ${currentLine + answer.failure.lineInChunk}`);
      }
      const columns = answer.columns as CsvChunkColumns;
      const out: SampleBlock[] = [];
      const { time, sync, ramp, gate, control, rowLines, rows } = columns;
      const firstLine = currentLine;
      builder.appendRows(time, sync, ramp, gate, control, rows, out, (row) => {
        currentLine = firstLine + (rowLines === null ? row : rowLines[row]);
      });
      currentLine = firstLine + columns.lines;
      // The column buffers go back to the thread that filled them, for its next chunk.
      const recycle: ChunkRecycle = { recycle: [time.buffer, sync.buffer, ramp.buffer, gate.buffer, control.buffer] as ArrayBuffer[] };
      workers[next.id % workers.length].postMessage(recycle, recycle.recycle);
      consumedBytes = next.endOffset;
      options.onProgress?.(consumedBytes, totalBytes);
      yield* out;
    }
    if (builder.totalSamples === 0) throw new InputError('the file has a header but no samples', path);
    const out: SampleBlock[] = [];
    builder.flush(out);
    yield* out;
  } finally {
    await Promise.all(workers.map((worker) => worker.terminate()));
    await handle.close();
  }
}
