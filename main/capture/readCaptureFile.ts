import { createReadStream } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { extname } from 'node:path';
import { InputError } from '../../app/errors';
import type { SampleBlock, SignalRole } from '../../app/capture/samples';
import type { CaptureReader } from '../../app/formats/captureReader';
import { createCsvReader } from '../../app/formats/csvReader';
import { parseComtradeConfig } from '../../app/formats/comtradeConfigParse';
import type { ComtradeConfig } from '../../app/formats/comtradeConfig';
import { createComtradeDataReader } from '../../app/formats/comtradeDataReader';
import { createComtradeCffReader } from '../../app/formats/comtradeCffReader';
import { assertFileExists, captureKindOf, comtradePartner } from './captureFiles';

export interface ReadCaptureOptions {
  /** Sample rate for a CSV without a t column (the command line's --rate). */
  sampleRateHz?: number;
  blockSamples?: number;
  /** COMTRADE channel id per role when the record does not use the ids sync, ramp, gate, control. */
  channelMap?: Partial<Record<SignalRole, string>>;
  /** Bytes per read; 1 MiB keeps system calls few and memory flat. */
  chunkBytes?: number;
}

/** A .cfg is a few kilobytes; anything far bigger is the wrong file. */
const maxConfigBytes = 4 << 20;

/** .cfg text: UTF-8 when it decodes cleanly (2013), else Latin-1, which older recorders write. */
function decodeConfigText(bytes: Uint8Array): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return new TextDecoder('latin1').decode(bytes);
  }
}

export async function readComtradeConfigFile(path: string): Promise<ComtradeConfig> {
  await assertFileExists(path, 'COMTRADE configuration (.cfg)');
  const bytes = await readFile(path);
  if (bytes.length > maxConfigBytes) throw new InputError(`the configuration is ${bytes.length} bytes: not a .cfg?`, path);
  return parseComtradeConfig(decodeConfigText(bytes), path);
}

async function* streamThrough(path: string, reader: CaptureReader, chunkBytes: number): AsyncGenerator<SampleBlock> {
  const stream = createReadStream(path, { highWaterMark: chunkBytes });
  try {
    for await (const chunk of stream) {
      const bytes = chunk as Buffer;
      yield* reader.push(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength));
    }
  } catch (error) {
    if (error instanceof InputError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(`reading failed (${code ?? String(error)})`, path);
  } finally {
    stream.destroy();
  }
  yield* reader.finish();
}

/**
 * Reads a capture file block by block: `.csv`, a COMTRADE pair given by either its `.cfg` or its `.dat`,
 * or a single-file COMTRADE `.cff` (2013).
 * The data is streamed in chunks, so a capture of any length costs the memory of one chunk and one block.
 */
export async function* readCaptureFile(path: string, options: ReadCaptureOptions = {}): AsyncGenerator<SampleBlock> {
  const kind = captureKindOf(path);
  const chunkBytes = options.chunkBytes ?? 1 << 20;
  await assertFileExists(path);
  if (kind === 'csv') {
    const reader = createCsvReader({ sampleRateHz: options.sampleRateHz, blockSamples: options.blockSamples, source: path });
    yield* streamThrough(path, reader, chunkBytes);
    return;
  }
  if (kind === 'comtrade-single') {
    const reader = createComtradeCffReader({ channelMap: options.channelMap, blockSamples: options.blockSamples, source: path });
    yield* streamThrough(path, reader, chunkBytes);
    return;
  }
  const isConfig = extname(path).toLowerCase() === '.cfg';
  const configPath = isConfig ? path : comtradePartner(path, '.cfg');
  const dataPath = isConfig ? comtradePartner(path, '.dat') : path;
  if (configPath === undefined) throw new InputError('the COMTRADE data has no .cfg beside it with the same name', path);
  if (dataPath === undefined) throw new InputError('the COMTRADE configuration has no .dat beside it with the same name', path);
  const config = await readComtradeConfigFile(configPath);
  const reader = createComtradeDataReader(config, { channelMap: options.channelMap, blockSamples: options.blockSamples, source: dataPath });
  yield* streamThrough(dataPath, reader, chunkBytes);
}
