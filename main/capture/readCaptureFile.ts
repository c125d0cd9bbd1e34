import { createReadStream } from 'node:fs';
import { readFile, stat } from 'node:fs/promises';
import { extname } from 'node:path';
import { InputError } from '../../app/errors';
import type { SampleBlock } from '../../app/capture/samples';
import type { ChannelMap } from '../../app/capture/channelMap';
import type { CsvDialectOptions } from '../../app/formats/csvSniff';
import type { CaptureReader } from '../../app/formats/captureReader';
import { createCsvReader } from '../../app/formats/csvReader';
import { parseComtradeConfig } from '../../app/formats/comtradeConfigParse';
import type { ComtradeConfig } from '../../app/formats/comtradeConfig';
import { createComtradeDataReader } from '../../app/formats/comtradeDataReader';
import { createComtradeCffReader } from '../../app/formats/comtradeCffReader';
import { assertFileExists, captureKindOf, comtradePartner } from './captureFiles';

export interface ReadCaptureOptions extends CsvDialectOptions {
  /** Sample rate for a CSV without a time column (the command line's --rate). */
  sampleRateHz?: number;
  blockSamples?: number;
  /** Which channel is which role (the command line's --map). */
  channelMap?: ChannelMap;
  /** A board design's stored map: used when it fits the file. */
  defaultMap?: ChannelMap;
  /** Bytes per read; 1 MiB keeps system calls few and memory flat. */
  chunkBytes?: number;
  /** Called as the data file is read (bytes so far, of the total), at most once per chunk. */
  onProgress?: (bytesRead: number, totalBytes: number) => void;
  /** Stops the reading: the blocks end with a CaptureCancelled error. */
  signal?: AbortSignal;
}

/** The reading was stopped on purpose (a Cancel button, a closed screen): not a fault of the file. */
export class CaptureCancelled extends Error {
  constructor(path: string) {
    super(`reading ${path} was cancelled`);
    this.name = 'CaptureCancelled';
  }
}

/** A capture opened for reading: its blocks, and how it is read once that is known. */
export interface OpenedCapture {
  blocks: AsyncGenerator<SampleBlock>;
  /** One line: columns or channels, units, timing, roles (null before the first lines are read). */
  readAs(): string | null;
  /** Bytes of the data file (the .dat of a COMTRADE pair). */
  totalBytes: number;
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

async function* streamThrough(path: string, reader: CaptureReader, options: ReadCaptureOptions, totalBytes: number): AsyncGenerator<SampleBlock> {
  const stream = createReadStream(path, { highWaterMark: options.chunkBytes ?? 1 << 20 });
  let bytesRead = 0;
  try {
    for await (const chunk of stream) {
      if (options.signal?.aborted) throw new CaptureCancelled(path);
      const bytes = chunk as Buffer;
      bytesRead += bytes.byteLength;
      const blocks = reader.push(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength));
      options.onProgress?.(bytesRead, totalBytes);
      yield* blocks;
    }
  } catch (error) {
    if (error instanceof InputError || error instanceof CaptureCancelled) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(`reading failed (${code ?? String(error)})`, path);
  } finally {
    stream.destroy();
  }
  yield* reader.finish();
}

async function byteSize(path: string): Promise<number> {
  return (await stat(path)).size;
}

/**
 * Opens a capture file for reading block by block: `.csv` (ours, or an instrument's dialect), a COMTRADE pair given
 * by either its `.cfg` or its `.dat`, or a single-file COMTRADE `.cff` (2013). The data is streamed in chunks, so
 * a capture of any length costs the memory of one chunk and one block.
 */
export async function openCaptureFile(path: string, options: ReadCaptureOptions = {}): Promise<OpenedCapture> {
  const kind = captureKindOf(path);
  await assertFileExists(path);
  let reader: CaptureReader;
  let dataPath = path;
  if (kind === 'csv') {
    reader = createCsvReader({ ...options, source: path });
  } else if (kind === 'comtrade-single') {
    reader = createComtradeCffReader({ channelMap: options.channelMap, defaultMap: options.defaultMap, blockSamples: options.blockSamples, source: path });
  } else {
    const isConfig = extname(path).toLowerCase() === '.cfg';
    const configPath = isConfig ? path : comtradePartner(path, '.cfg');
    const partner = isConfig ? comtradePartner(path, '.dat') : path;
    if (configPath === undefined) throw new InputError('the COMTRADE data has no .cfg beside it with the same name', path);
    if (partner === undefined) throw new InputError('the COMTRADE configuration has no .dat beside it with the same name', path);
    dataPath = partner;
    const config = await readComtradeConfigFile(configPath);
    reader = createComtradeDataReader(config, { channelMap: options.channelMap, defaultMap: options.defaultMap, blockSamples: options.blockSamples, source: dataPath });
  }
  const totalBytes = await byteSize(dataPath);
  return { blocks: streamThrough(dataPath, reader, options, totalBytes), readAs: () => reader.readAs(), totalBytes };
}

/** The blocks of a capture file (see openCaptureFile). */
export async function* readCaptureFile(path: string, options: ReadCaptureOptions = {}): AsyncGenerator<SampleBlock> {
  yield* (await openCaptureFile(path, options)).blocks;
}
