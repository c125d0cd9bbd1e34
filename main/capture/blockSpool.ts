import { open, type FileHandle } from 'node:fs/promises';
import type { SampleBlock } from '../../app/capture/samples';

/**
 * A temporary file of blocks as raw float64, so a writer can pass over a capture twice (COMTRADE needs the
 * range of every channel before it can choose a and b) while holding only one block in memory.
 * Each block: [length, startS, sampleRateHz, afterGap, hasControl] then the channels one after another.
 */
const headerValues = 5;

export class BlockSpool {
  private position = 0;
  private constructor(private readonly handle: FileHandle) {}

  static async create(path: string): Promise<BlockSpool> {
    return new BlockSpool(await open(path, 'w+'));
  }

  async append(block: SampleBlock): Promise<void> {
    const length = block.sync.length;
    const channels = block.control === null ? 3 : 4;
    const values = new Float64Array(headerValues + channels * length);
    values.set([length, block.startS, block.sampleRateHz, block.afterGap ? 1 : 0, block.control === null ? 0 : 1]);
    values.set(block.sync, headerValues);
    values.set(block.ramp, headerValues + length);
    values.set(block.gate, headerValues + 2 * length);
    if (block.control !== null) values.set(block.control, headerValues + 3 * length);
    const bytes = new Uint8Array(values.buffer);
    await this.handle.write(bytes, 0, bytes.length, this.position);
    this.position += bytes.length;
  }

  async *blocks(): AsyncGenerator<SampleBlock> {
    let position = 0;
    const header = new Float64Array(headerValues);
    const headerBytes = new Uint8Array(header.buffer);
    while (position < this.position) {
      await this.handle.read(headerBytes, 0, headerBytes.length, position);
      position += headerBytes.length;
      const [length, startS, sampleRateHz, afterGap, hasControl] = header;
      const channels = hasControl === 1 ? 4 : 3;
      const values = new Float64Array(channels * length);
      const bytes = new Uint8Array(values.buffer);
      await this.handle.read(bytes, 0, bytes.length, position);
      position += bytes.length;
      yield {
        startS,
        sampleRateHz,
        afterGap: afterGap === 1,
        sync: values.subarray(0, length),
        ramp: values.subarray(length, 2 * length),
        gate: values.subarray(2 * length, 3 * length),
        control: hasControl === 1 ? values.subarray(3 * length, 4 * length) : null,
      };
    }
  }

  async close(): Promise<void> {
    await this.handle.close();
  }
}
