import { createWriteStream, type WriteStream } from 'node:fs';
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

async function writeChunk(stream: WriteStream, chunk: string | Uint8Array): Promise<void> {
  if (!stream.write(chunk)) await new Promise<void>((resolve, reject) => {
    const onError = (error: Error) => reject(error);
    stream.once('error', onError);
    stream.once('drain', () => {
      stream.off('error', onError);
      resolve();
    });
  });
}

async function closeStream(stream: WriteStream): Promise<void> {
  await new Promise<void>((resolve, reject) => {
    stream.once('error', reject);
    stream.end(() => resolve());
  });
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
    return withPartialFile(path, async (partialPath) => {
      const stream = createWriteStream(partialPath);
      const writer = createCsvWriter(options.csv);
      let samples = 0;
      try {
        for await (const block of blocks) {
          await writeChunk(stream, writer.write(block));
          samples += block.sync.length;
        }
      } finally {
        await closeStream(stream);
      }
      if (samples === 0) throw new InputError('there are no samples to write', path);
      return { paths: [path], samples };
    });
  }
  const folder = dirname(path);
  const base = basename(path, extname(path));
  const configPath = join(folder, `${base}.cfg`);
  const dataPath = join(folder, `${base}.dat`);
  const spoolPath = join(folder, `.${base}.${process.pid}.spool`);
  const spool = await BlockSpool.create(spoolPath);
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
    await withPartialFile(dataPath, async (partialPath) => {
      const stream = createWriteStream(partialPath);
      try {
        for await (const block of spool.blocks()) await writeChunk(stream, encoder.encode(block));
      } finally {
        await closeStream(stream);
      }
    });
    await withPartialFile(configPath, (partialPath) => writeFile(partialPath, formatComtradeConfig(config)));
    return { paths: [configPath, dataPath], samples: stats.samples };
  } finally {
    await spool.close();
    await rm(spoolPath, { force: true });
  }
}
