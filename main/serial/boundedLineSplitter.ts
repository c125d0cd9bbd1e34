/**
 * Bytes off the port into lines, with a cap on line length. @serialport/parser-readline keeps a whole line in memory
 * until its delimiter arrives, so a logger gone wrong (or noise without newlines) would grow it without bound; here a
 * line that reaches `maxLineBytes` is handed on cut at that length, marked truncated, and the rest up to the next
 * newline is counted and thrown away. Line ends: LF, with a CR before it removed (CRLF loggers are common).
 */
export interface SplitLine {
  text: string;
  truncated: boolean;
}

export interface LongLine {
  /** Length the line really had (bytes, terminator excluded). */
  bytes: number;
  keptBytes: number;
}

export interface BoundedLineSplitter {
  /** Feeds bytes; calls back for each complete (or cut) line and for each over-long line once its end arrives. */
  push(chunk: Uint8Array, onLine: (line: SplitLine) => void, onLongLine: (line: LongLine) => void): void;
  /** Bytes held for the line not yet ended (never more than maxLineBytes). */
  pendingBytes(): number;
  reset(): void;
}

const lineFeed = 0x0a;
const carriageReturn = 0x0d;

export function createBoundedLineSplitter(maxLineBytes: number): BoundedLineSplitter {
  if (!Number.isInteger(maxLineBytes) || maxLineBytes < 1) throw new RangeError(`maxLineBytes must be a whole number above 0, not ${maxLineBytes}`);
  const decoder = new TextDecoder('utf-8', { fatal: false });
  let pending = new Uint8Array(Math.min(maxLineBytes, 4096));
  let pendingLength = 0;
  /** Bytes of the current line after it was cut, or -1 while the line is within the cap. */
  let overflow = -1;

  const append = (bytes: Uint8Array): void => {
    if (pendingLength + bytes.length > pending.length) {
      const grown = new Uint8Array(Math.min(maxLineBytes, Math.max(pending.length * 2, pendingLength + bytes.length)));
      grown.set(pending.subarray(0, pendingLength));
      pending = grown;
    }
    pending.set(bytes, pendingLength);
    pendingLength += bytes.length;
  };

  const text = (): string => {
    let end = pendingLength;
    if (overflow < 0 && end > 0 && pending[end - 1] === carriageReturn) end -= 1;
    return decoder.decode(pending.subarray(0, end));
  };

  return {
    push(chunk, onLine, onLongLine) {
      let start = 0;
      while (start < chunk.length) {
        const newline = chunk.indexOf(lineFeed, start);
        const end = newline < 0 ? chunk.length : newline;
        let piece = chunk.subarray(start, end);
        if (overflow >= 0) {
          overflow += piece.length;
        } else {
          const room = maxLineBytes - pendingLength;
          if (piece.length > room) {
            append(piece.subarray(0, room));
            overflow = pendingLength + (piece.length - room);
            onLine({ text: text(), truncated: true });
            piece = piece.subarray(0, 0);
          } else {
            append(piece);
          }
        }
        if (newline < 0) break;
        if (overflow >= 0) {
          onLongLine({ bytes: overflow, keptBytes: maxLineBytes });
        } else {
          onLine({ text: text(), truncated: false });
        }
        pendingLength = 0;
        overflow = -1;
        start = newline + 1;
      }
    },
    pendingBytes: () => pendingLength,
    reset() {
      pendingLength = 0;
      overflow = -1;
    },
  };
}
