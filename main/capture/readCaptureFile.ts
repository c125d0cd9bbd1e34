import { createReadStream } from 'node:fs';
import { open, readFile, stat } from 'node:fs/promises';
import { extname } from 'node:path';
import { InputError } from '../../app/errors';
import type { SampleBlock } from '../../app/capture/samples';
import type { ChannelMap } from '../../app/capture/channelMap';
import type { CsvDialectOptions } from '../../app/formats/csvSniff';
import type { CaptureReader } from '../../app/formats/captureReader';
import { createCsvReader, csvSniffBytes, layoutFromStart } from '../../app/formats/csvReader';
import { mapComtradeChannels } from '../../app/formats/comtradeChannelMap';
import { parseComtradeConfig } from '../../app/formats/comtradeConfigParse';
import type { ComtradeConfig } from '../../app/formats/comtradeConfig';
import { createComtradeDataReader } from '../../app/formats/comtradeDataReader';
import { comtradeCffSections, createComtradeCffReader } from '../../app/formats/comtradeCffReader';
import { assertFileExists, captureKindOf, comtradePartner } from './captureFiles';
import { CaptureCancelled, type OpenedCapture } from './openedCapture';
import { openParallelCsv } from './parallelCsv';

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
  /**
   * Parse a CSV on parser threads (main/capture/parallelCsv.ts): true, false, or by size (default: files of
   * 32 MiB and more, where starting the threads pays).
   */
  parallel?: boolean;
  /** Parser threads and bytes per run of lines, for the parallel path (tests use small runs). */
  threads?: number;
  parallelChunkBytes?: number;
}

export { CaptureCancelled, type OpenedCapture } from './openedCapture';

/** CSV files from this size on are parsed on threads unless told otherwise. */
export const parallelCsvFromBytes = 32 << 20;

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
    const totalBytes = await byteSize(path);
    if (options.parallel ?? totalBytes >= parallelCsvFromBytes) {
      return openParallelCsv(path, totalBytes, { ...options, chunkBytes: options.parallelChunkBytes });
    }
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

/**
 * Checks that a capture can be read as asked (its layout, its channels for the roles) from its start, without
 * reading it through: a refusal comes before anything is measured. Throws the reader's InputError.
 */
export async function checkCaptureFile(path: string, options: ReadCaptureOptions = {}): Promise<void> {
  const kind = captureKindOf(path);
  await assertFileExists(path);
  if (kind === 'comtrade') return void (await openCaptureFile(path, options));
  const handle = await open(path, 'r');
  try {
    const { size } = await handle.stat();
    const head = new Uint8Array(Math.min(size, kind === 'csv' ? csvSniffBytes : 1 << 20));
    const { bytesRead } = await handle.read(head, 0, head.length, 0);
    if (kind === 'csv') {
      layoutFromStart(head.subarray(0, bytesRead), bytesRead >= size, options, path);
    } else {
      const sections = comtradeCffSections(head.subarray(0, bytesRead), path);
      mapComtradeChannels(parseComtradeConfig(sections.configText, `${path} (CFG section)`), options.channelMap, path, options.defaultMap);
    }
  } finally {
    await handle.close();
  }
}

/** The blocks of a capture file (see openCaptureFile). */
export async function* readCaptureFile(path: string, options: ReadCaptureOptions = {}): AsyncGenerator<SampleBlock> {
  yield* (await openCaptureFile(path, options)).blocks;
}
