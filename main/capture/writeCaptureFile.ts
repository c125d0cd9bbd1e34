import { createWriteStream } from 'node:fs';
import { once } from 'node:events';
import { finished } from 'node:stream/promises';
import { rename, rm, writeFile } from 'node:fs/promises';
import { basename, dirname, extname, join } from 'node:path';
import { InputError } from '../../app/errors';
import type { SampleBlock } from '../../app/capture/samples';
import { createCsvWriter, type CsvWriterOptions } from '../../app/formats/csvWriter';
import type { ComtradeFileType } from '../../app/formats/comtradeConfig';
import { formatComtradeConfig } from '../../app/formats/comtradeConfigFormat';
import { createComtradeDataEncoder } from '../../app/formats/comtradeDataEncoder';
import { ComtradeStatsCollector, comtradeTimeOriginS, planComtradeConfig } from '../../app/formats/comtradeWritePlan';
import { BlockSpool } from './blockSpool';

export type CaptureWriteFormat = 'csv' | 'comtrade-ascii' | 'comtrade-binary' | 'comtrade-binary32' | 'comtrade-float32';

export interface WriteCaptureOptions {
  /** Default: csv for a .csv path, comtrade-binary for .cfg or .dat. */
  format?: CaptureWriteFormat;
  stationName?: string;
  lineFrequencyHz?: number;
  /** COMTRADE revision of the .cfg layout; 1999 unless asked. */
  revision?: 1999 | 2013;
  /** Wall-clock time of the first sample for the .cfg (UTC); the epoch when not given, so files are reproducible. */
  recordedAt?: Date;
  csv?: CsvWriterOptions;
}

export interface WrittenCapture {
  /** The files written: the CSV, or the .cfg and the .dat. */
  paths: string[];
  samples: number;
}

const fileTypeOf: Record<Exclude<CaptureWriteFormat, 'csv'>, ComtradeFileType> = {
  'comtrade-ascii': 'ASCII',
  'comtrade-binary': 'BINARY',
  'comtrade-binary32': 'BINARY32',
  'comtrade-float32': 'FLOAT32',
};

function formatFor(path: string, format: CaptureWriteFormat | undefined): CaptureWriteFormat {
  if (format !== undefined) return format;
  const extension = extname(path).toLowerCase();
  if (extension === '.csv') return 'csv';
  if (extension === '.cfg' || extension === '.dat') return 'comtrade-binary';
  throw new InputError(`cannot tell the capture format from "${extension || '(no extension)'}": use .csv, .cfg or .dat, or give the format`, path);
}

/**
 * Writes chunks to a file with back-pressure; any stream error (no such folder, disk full) rejects instead
 * of being lost, and the stream is always closed.
 */
async function writeStreamed(path: string, produce: (write: (chunk: string | Uint8Array) => Promise<void>) => Promise<void>): Promise<void> {
  const stream = createWriteStream(path);
  let failure: Error | undefined;
  stream.on('error', (error) => {
    failure ??= error;
  });
  const write = async (chunk: string | Uint8Array): Promise<void> => {
    if (failure !== undefined) throw failure;
    // events.once rejects if the stream errors while waiting for drain.
    if (!stream.write(chunk)) await once(stream, 'drain');
  };
  try {
    await produce(write);
    stream.end();
    await finished(stream);
  } catch (error) {
    stream.destroy();
    await finished(stream).catch(() => undefined);
    throw error;
  }
  if (failure !== undefined) throw failure;
}

/** File-system failures become InputErrors naming the file (a bad output path is the user's to fix); other InputErrors get the path too. */
function asInputError(error: unknown, path: string): unknown {
  if (error instanceof InputError) return error.where === undefined ? new InputError(error.message, path) : error;
  const code = (error as NodeJS.ErrnoException | undefined)?.code;
  if (typeof code !== 'string') return error;
  const reasons: Record<string, string> = { ENOENT: 'the folder does not exist', EACCES: 'permission denied', ENOSPC: 'the disk is full', EROFS: 'the disk is read-only', EISDIR: 'it is a folder' };
  return new InputError(`cannot write the capture: ${reasons[code] ?? code}`, path);
}

/** Writes to `path.partial`, then renames: a failed write never leaves half a capture under the real name. */
async function withPartialFile<T>(path: string, write: (partialPath: string) => Promise<T>): Promise<T> {
  const partialPath = `${path}.partial`;
  try {
    const result = await write(partialPath);
    await rename(partialPath, path);
    return result;
  } catch (error) {
    await rm(partialPath, { force: true });
    throw error;
  }
}

/**
 * Writes a capture as CSV or as a COMTRADE .cfg + .dat pair (IEEE C37.111) from blocks that may arrive
 * one at a time. COMTRADE needs each channel's range before its scaling can be chosen, so its blocks are
 * first spooled to a temporary file beside the target and encoded in a second pass: memory stays one block.
 */
export async function writeCaptureFile(
  path: string,
  blocks: AsyncIterable<SampleBlock> | Iterable<SampleBlock>,
  options: WriteCaptureOptions = {},
): Promise<WrittenCapture> {
  const format = formatFor(path, options.format);
  if (format === 'csv') {
    try {
      return await withPartialFile(path, async (partialPath) => {
        const writer = createCsvWriter(options.csv);
        let samples = 0;
        await writeStreamed(partialPath, async (write) => {
          for await (const block of blocks) {
            await write(writer.write(block));
            samples += block.sync.length;
          }
        });
        if (samples === 0) throw new InputError('there are no samples to write');
        return { paths: [path], samples };
      });
    } catch (error) {
      throw asInputError(error, path);
    }
  }
  const folder = dirname(path);
  const base = basename(path, extname(path));
  const configPath = join(folder, `${base}.cfg`);
  const dataPath = join(folder, `${base}.dat`);
  const spoolPath = join(folder, `.${base}.${process.pid}.spool`);
  let spool: BlockSpool;
  try {
    spool = await BlockSpool.create(spoolPath);
  } catch (error) {
    throw asInputError(error, path);
  }
  try {
    const collector = new ComtradeStatsCollector();
    for await (const block of blocks) {
      collector.observe(block);
      await spool.append(block);
    }
    const stats = collector.result();
    const config = planComtradeConfig(stats, {
      fileType: fileTypeOf[format],
      revision: options.revision,
      stationName: options.stationName,
      lineFrequencyHz: options.lineFrequencyHz,
      recordedAt: options.recordedAt,
    });
    const encoder = createComtradeDataEncoder(config, { timeOriginS: comtradeTimeOriginS(stats) });
    await withPartialFile(dataPath, (partialPath) =>
      writeStreamed(partialPath, async (write) => {
        for await (const block of spool.blocks()) await write(encoder.encode(block));
      }),
    );
    await withPartialFile(configPath, (partialPath) => writeFile(partialPath, formatComtradeConfig(config)));
    return { paths: [configPath, dataPath], samples: stats.samples };
  } catch (error) {
    throw asInputError(error, path);
  } finally {
    await spool.close();
    await rm(spoolPath, { force: true });
  }
}
