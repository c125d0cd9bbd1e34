import { InputError } from '../errors';
import type { SampleBlock } from '../capture/samples';
import type { CaptureReader } from './captureReader';
import { parseComtradeConfig } from './comtradeConfigParse';
import { createComtradeDataReader, type ComtradeDataReaderOptions } from './comtradeDataReader';
import { maxLineBytes } from './lineSplitter';
import { decodeUtf8, encodeUtf8 } from './utf8';

/**
 * Section header of the 2013 single-file form (.cff), e.g. `--- file type: CFG ---`,
 * `--- file type: DAT ASCII ---`, `--- file type: DAT BINARY: 1234 ---` (the byte count of the binary data).
 * Layout from memory of IEEE C37.111-2013; compared with a public sample's layout, not copied.
 */
const sectionHeader = /^---\s*file type:\s*([a-z]+)(?:\s+([a-z0-9]+))?(?:\s*:\s*(\d+))?\s*---\s*$/i;

/**
 * The CFG text and the start of the DAT bytes of a single-file record, from its first bytes (for a first look; the
 * reader below streams the whole file). Throws when the CFG section or the DAT header is not within them.
 */
export function comtradeCffSections(head: Uint8Array, source: string): { configText: string; data: Uint8Array } {
  const configLines: string[] = [];
  let section: 'before' | 'cfg' | 'other' = 'before';
  let position = 0;
  while (position < head.length) {
    let end = head.indexOf(0x0a, position);
    if (end < 0) end = head.length;
    const text = decodeUtf8(head, position, end > position && head[end - 1] === 0x0d ? end - 1 : end);
    const header = sectionHeader.exec(text.replace(/^\uFEFF/, '').trim());
    position = end + 1;
    if (header !== null) {
      const kind = header[1].toUpperCase();
      if (kind === 'DAT') return { configText: configLines.join('\n'), data: head.subarray(Math.min(position, head.length)) };
      section = kind === 'CFG' ? 'cfg' : 'other';
    } else if (section === 'cfg') {
      configLines.push(text);
    }
  }
  throw new InputError(configLines.length === 0 ? 'no CFG section at the start of the file' : 'no DAT section within the first megabyte', source);
}

type Section = 'before' | 'cfg' | 'other' | 'dat-text' | 'dat-binary' | 'after';

/**
 * Streaming reader for a single-file COMTRADE record (.cff, 2013): the CFG section is collected and parsed,
 * INF and HDR sections are skipped, and the DAT section is streamed through the .dat reader. The DAT
 * section is taken to be the last one (ASCII data runs to the end; binary data is exactly its byte count).
 */
export function createComtradeCffReader(options: ComtradeDataReaderOptions = {}): CaptureReader {
  const source = options.source ?? 'COMTRADE single file';
  let section: Section = 'before';
  let lineNumber = 0;
  let carry = new Uint8Array(0);
  const configLines: string[] = [];
  let configBytes = 0;
  let data: CaptureReader | null = null;
  let binaryBytesLeft = 0;
  let pendingHighSurrogate = '';

  const where = () => `${source}, line ${lineNumber}`;

  const startData = (type: string | undefined, byteCount: string | undefined): void => {
    if (configLines.length === 0) throw new InputError('the DAT section comes before any CFG section', where());
    const config = parseComtradeConfig(configLines.join('\n'), `${source} (CFG section)`);
    const declared = (type ?? config.fileType).toUpperCase();
    if (declared !== config.fileType) {
      throw new InputError(`the DAT section says ${declared} but the CFG section says ${config.fileType}`, where());
    }
    data = createComtradeDataReader(config, { ...options, source: `${source} (DAT section)` });
    if (config.fileType === 'ASCII') {
      section = 'dat-text';
    } else {
      if (byteCount === undefined) throw new InputError(`the ${declared} DAT section header lacks its byte count ("DAT ${declared}: n")`, where());
      binaryBytesLeft = Number(byteCount);
      section = 'dat-binary';
    }
  };

  const handleLine = (bytes: Uint8Array, start: number, end: number): void => {
    lineNumber++;
    if (end > start && bytes[end - 1] === 0x0d) end--;
    const text = decodeUtf8(bytes, start, end);
    const header = sectionHeader.exec(text.replace(/^\uFEFF/, '').trim());
    if (header !== null) {
      const kind = header[1].toUpperCase();
      if (kind === 'CFG') section = 'cfg';
      else if (kind === 'DAT') startData(header[2], header[3]);
      else section = 'other';
      return;
    }
    if (section === 'cfg') {
      configBytes += end - start;
      if (configBytes > 4 << 20) throw new InputError('the CFG section is over 4 MiB: not a configuration', where());
      configLines.push(text);
    } else if (section === 'before' && text.trim() !== '') {
      throw new InputError('a single-file COMTRADE record starts with "--- file type: CFG ---"', where());
    }
  };

  const push = (chunk: Uint8Array, out: SampleBlock[]): void => {
    let bytes = chunk;
    if (carry.length > 0) {
      bytes = new Uint8Array(carry.length + chunk.length);
      bytes.set(carry);
      bytes.set(chunk, carry.length);
      carry = new Uint8Array(0);
    }
    let position = 0;
    while (position < bytes.length) {
      if (section === 'dat-text' && data !== null) {
        out.push(...data.push(bytes.subarray(position)));
        return;
      }
      if (section === 'dat-binary' && data !== null) {
        const take = Math.min(binaryBytesLeft, bytes.length - position);
        out.push(...data.push(bytes.subarray(position, position + take)));
        binaryBytesLeft -= take;
        position += take;
        if (binaryBytesLeft === 0) section = 'after';
        continue;
      }
      if (section === 'after') return;
      const newline = bytes.indexOf(0x0a, position);
      if (newline < 0) {
        if (bytes.length - position > maxLineBytes) throw new InputError(`line ${lineNumber + 1} is longer than ${maxLineBytes} bytes`, source);
        carry = bytes.slice(position);
        return;
      }
      handleLine(bytes, position, newline);
      position = newline + 1;
    }
  };

  return {
    readAs: () => data?.readAs() ?? null,
    push(chunk) {
      const out: SampleBlock[] = [];
      if (typeof chunk === 'string') {
        // Keep a high surrogate cut from its partner for the next chunk.
        let text = pendingHighSurrogate + chunk;
        pendingHighSurrogate = '';
        const last = text.charCodeAt(text.length - 1);
        if (last >= 0xd800 && last <= 0xdbff) {
          pendingHighSurrogate = text.slice(-1);
          text = text.slice(0, -1);
        }
        push(encodeUtf8(text), out);
      } else {
        push(chunk, out);
      }
      return out;
    },
    finish() {
      const out: SampleBlock[] = [];
      if (pendingHighSurrogate !== '') push(encodeUtf8(pendingHighSurrogate), out);
      pendingHighSurrogate = '';
      if (carry.length > 0 && section !== 'dat-text' && section !== 'dat-binary') {
        const last = carry;
        carry = new Uint8Array(0);
        handleLine(last, 0, last.length);
      }
      const reader: CaptureReader | null = data;
      if (reader === null) throw new InputError('the file has no DAT section', source);
      if (section === 'dat-binary' && binaryBytesLeft > 0) {
        throw new InputError(`the DAT section ends ${binaryBytesLeft} bytes short of the count in its header`, source);
      }
      out.push(...reader.finish());
      return out;
    },
  };
}
