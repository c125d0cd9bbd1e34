import { InputError } from '../errors';
import { encodeUtf8 } from './utf8';

/**
 * Cuts a chunked byte stream into lines for the text readers (CSV, ASCII COMTRADE). Works on bytes, so a
 * chunk may end inside a UTF-8 character: the newline byte 0x0A never occurs inside a multi-byte sequence.
 * A trailing CR is dropped (CRLF files). Lines are handed over as (bytes, start, end) views, copied only when
 * a line straddles two chunks. String chunks are encoded, keeping a high surrogate split from its partner.
 */
export type LineHandler = (bytes: Uint8Array, start: number, end: number, lineNumber: number) => void;

/** A line longer than this is not a capture row: stop before buffering a whole corrupt file. */
export const maxLineBytes = 1 << 20;

export class LineSplitter {
  private carry: Uint8Array | null = null;
  private carryLength = 0;
  private pendingHighSurrogate = '';
  private lineNumber = 0;

  constructor(
    private readonly onLine: LineHandler,
    private readonly source: string,
  ) {}

  get linesSeen(): number {
    return this.lineNumber;
  }

  push(chunk: Uint8Array | string): void {
    const bytes = typeof chunk === 'string' ? this.encodeText(chunk) : chunk;
    let start = 0;
    if (this.carry !== null) {
      const newline = bytes.indexOf(0x0a);
      if (newline < 0) {
        this.appendCarry(bytes, 0, bytes.length);
        return;
      }
      this.appendCarry(bytes, 0, newline);
      const line = this.carry;
      const length = this.carryLength;
      this.carry = null;
      this.carryLength = 0;
      this.emit(line, 0, length);
      start = newline + 1;
    }
    for (;;) {
      const newline = bytes.indexOf(0x0a, start);
      if (newline < 0) break;
      this.emit(bytes, start, newline);
      start = newline + 1;
    }
    if (start < bytes.length) this.appendCarry(bytes, start, bytes.length);
  }

  /** Ends the stream: a last line without a newline is still a line. */
  finish(): void {
    if (this.pendingHighSurrogate !== '') {
      const tail = encodeUtf8(this.pendingHighSurrogate);
      this.pendingHighSurrogate = '';
      this.appendCarry(tail, 0, tail.length);
    }
    if (this.carry !== null) {
      const line = this.carry;
      const length = this.carryLength;
      this.carry = null;
      this.carryLength = 0;
      this.emit(line, 0, length);
    }
  }

  private emit(bytes: Uint8Array, start: number, end: number): void {
    this.lineNumber++;
    if (end > start && bytes[end - 1] === 0x0d) end--;
    this.onLine(bytes, start, end, this.lineNumber);
  }

  private appendCarry(bytes: Uint8Array, start: number, end: number): void {
    const needed = this.carryLength + (end - start);
    if (needed > maxLineBytes) {
      throw new InputError(`line ${this.lineNumber + 1} is longer than ${maxLineBytes} bytes: not a capture file?`, this.source);
    }
    if (this.carry === null || this.carry.length < needed) {
      const grown = new Uint8Array(Math.max(needed, 256, this.carry === null ? 0 : this.carry.length * 2));
      if (this.carry !== null) grown.set(this.carry.subarray(0, this.carryLength));
      this.carry = grown;
    }
    this.carry.set(bytes.subarray(start, end), this.carryLength);
    this.carryLength = needed;
  }

  private encodeText(chunk: string): Uint8Array {
    let text = this.pendingHighSurrogate + chunk;
    this.pendingHighSurrogate = '';
    const last = text.charCodeAt(text.length - 1);
    if (last >= 0xd800 && last <= 0xdbff) {
      this.pendingHighSurrogate = text.slice(-1);
      text = text.slice(0, -1);
    }
    return encodeUtf8(text);
  }
}
