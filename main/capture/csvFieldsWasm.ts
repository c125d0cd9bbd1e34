/**
 * The plain-row reader of the CSV parser threads in WebAssembly (wasm/csvFields.ts, built to dist/csvFields.wasm by
 * `npm run build`), behind app/formats/csvChunk.ts's CsvRowAccelerator. The module is compiled once by the reading
 * thread and handed to each parser thread, which gives it a memory of its own: the chunk's bytes are copied in once,
 * the rows come out in five columns and are copied into the chunk's arrays. Without the built file, the threads read
 * with the TypeScript parser alone (the same columns, at half the speed).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { CsvChunkScratch, CsvRowAccelerator } from '../../app/formats/csvChunk';
import type { CsvRowPlan } from '../../app/formats/csvRows';
import { packageRoot } from '../session/packagePaths';

interface CsvFieldsExports {
  heapBase(): number;
  parseRows(input: number, start: number, length: number, columnCount: number, slotsAt: number, factorsAt: number, separator: number, decimalMark: number, tabIsBlank: number, out: number, capacity: number): number;
  stop(): number;
}

/** Rows per call: the output columns' size in the module's memory (5 x 8 bytes a row: 2.5 MiB). */
const rowsPerCall = 65536;
const pageBytes = 65536;
const tab = 0x09;

export function csvFieldsWasmPath(): string {
  return join(packageRoot(), 'dist', 'csvFields.wasm');
}

/** The compiled module, or null when it was not built (the parser threads then read in TypeScript). */
export function loadCsvFieldsModule(path: string = csvFieldsWasmPath()): WebAssembly.Module | null {
  if (!existsSync(path)) return null;
  return new WebAssembly.Module(readFileSync(path));
}

export function createWasmRowAccelerator(module: WebAssembly.Module): CsvRowAccelerator {
  const memory = new WebAssembly.Memory({ initial: 1 });
  const exports = new WebAssembly.Instance(module, { env: { memory } }).exports as unknown as CsvFieldsExports;
  const slotsAt = exports.heapBase();
  let factorsAt = 0;
  let inputAt = 0;
  let outAt = 0;
  let length = 0;
  let plan: CsvRowPlan | null = null;
  let tabIsBlank = 1;
  const accelerator = {
    stop: 0,
    load(bytes: Uint8Array, rowPlan: CsvRowPlan): void {
      plan = rowPlan;
      tabIsBlank = rowPlan.separator === tab ? 0 : 1;
      factorsAt = (slotsAt + rowPlan.slots.length + 15) & ~15;
      inputAt = factorsAt + 5 * 8;
      outAt = (inputAt + bytes.length + 15) & ~15;
      const needed = outAt + 5 * 8 * rowsPerCall;
      if (needed > memory.buffer.byteLength) memory.grow(Math.ceil((needed - memory.buffer.byteLength) / pageBytes));
      new Int8Array(memory.buffer, slotsAt, rowPlan.slots.length).set(rowPlan.slots);
      new Float64Array(memory.buffer, factorsAt, 5).set(rowPlan.factors.subarray(0, 5));
      new Uint8Array(memory.buffer, inputAt, bytes.length).set(bytes);
      length = bytes.length;
    },
    take(position: number, columns: CsvChunkScratch, row: number, room: number): number {
      if (plan === null) throw new Error('take before load');
      const capacity = Math.min(room, rowsPerCall);
      const taken = exports.parseRows(inputAt, position, length, plan.columnCount, slotsAt, factorsAt, plan.separator, plan.decimalMark, tabIsBlank, outAt, capacity);
      accelerator.stop = exports.stop();
      if (taken > 0) {
        const out = new Float64Array(memory.buffer, outAt, 5 * capacity);
        columns.time.set(out.subarray(0, taken), row);
        columns.sync.set(out.subarray(capacity, capacity + taken), row);
        columns.ramp.set(out.subarray(2 * capacity, 2 * capacity + taken), row);
        columns.gate.set(out.subarray(3 * capacity, 3 * capacity + taken), row);
        columns.control.set(out.subarray(4 * capacity, 4 * capacity + taken), row);
      }
      return taken;
    },
  };
  return accelerator;
}
