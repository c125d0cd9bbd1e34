/**
 * A parser thread for long CSV captures (main/capture/parallelCsv.ts): takes runs of whole lines, gives back column
 * arrays (app/formats/csvChunk.ts). The compiled WebAssembly reader comes with the thread's start, the row plan in the
 * first message; buffers travel by transfer.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { isChunkFailure, parseCsvChunk, type CsvChunkScratch } from '../../app/formats/csvChunk';
import type { CsvRowPlan } from '../../app/formats/csvRows';
import { createWasmRowAccelerator } from './csvFieldsWasm';

export interface ChunkRequest {
  id: number;
  buffer: ArrayBuffer;
  length: number;
}

/** Column buffers the reader has finished with, back for reuse (five, of one length). */
export interface ChunkRecycle {
  recycle: ArrayBuffer[];
}

/** The row plan, sent first: the thread starts while the reader is still sniffing the file's start. */
export interface ChunkPlan {
  plan: CsvRowPlan;
}

const { fields } = workerData as { fields: WebAssembly.Module | null };
// The plain rows in WebAssembly when the module was built (csvFieldsWasm.ts), else all in TypeScript.
const accelerator = fields ? createWasmRowAccelerator(fields) : undefined;
const pool: CsvChunkScratch[] = [];

let plan: CsvRowPlan | null = null;

parentPort?.on('message', (message: ChunkRequest | ChunkRecycle | ChunkPlan) => {
  if ('plan' in message) {
    plan = message.plan;
    return;
  }
  if (plan === null) throw new Error('a chunk before the row plan');
  if ('recycle' in message) {
    const [time, sync, ramp, gate, control] = message.recycle.map((buffer) => new Float64Array(buffer));
    pool.push({ time, sync, ramp, gate, control });
    return;
  }
  const request = message;
  const bytes = new Uint8Array(request.buffer, 0, request.length);
  const result = parseCsvChunk(bytes, plan, pool.pop(), accelerator);
  if (isChunkFailure(result)) {
    parentPort?.postMessage({ id: request.id, buffer: request.buffer, failure: result }, [request.buffer]);
    return;
  }
  const columns = [result.time, result.sync, result.ramp, result.gate, result.control];
  const transfer: ArrayBuffer[] = [request.buffer, ...columns.map((column) => column.buffer as ArrayBuffer)];
  if (result.rowLines) transfer.push(result.rowLines.buffer as ArrayBuffer);
  parentPort?.postMessage({ id: request.id, buffer: request.buffer, columns: result }, transfer);
});
