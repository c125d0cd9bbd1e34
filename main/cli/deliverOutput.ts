/**
 * The command line's way out: every byte written to stdout and stderr is handed to the operating system before
 * the process exits with its code. On a pipe Node writes asynchronously, so `process.exit()` straight after a
 * large `process.stdout.write()` drops whatever the pipe had not yet taken (a 64 KiB pipe buffer cut a JSON
 * result short with exit 0). A reader that goes away early (`| head`) is not an error of ours: the rest of the
 * output has nowhere to go, and the command still exits with its own code.
 */

type OutputStream = NodeJS.WriteStream;

/** Resolves once everything written to `stream` so far has been handed on, or the stream can take no more. */
export function outputDrained(stream: OutputStream): Promise<void> {
  return new Promise((resolve) => {
    if (stream.destroyed || stream.writableEnded || !stream.writable) {
      resolve();
      return;
    }
    // Writes are handed on in order, so the callback of an empty write runs after every earlier one has gone.
    // It also runs (with an error) when the reader has closed its end.
    stream.write('', () => resolve());
  });
}

/** A closed reader (EPIPE) ends our output quietly instead of throwing a stack trace from an unhandled 'error'. */
export function toleratePipeClosed(stream: OutputStream): void {
  stream.on('error', (error: NodeJS.ErrnoException) => {
    if (error.code === 'EPIPE' || error.code === 'ERR_STREAM_DESTROYED') return;
    throw error;
  });
}

/** Waits for stdout and stderr to drain, then exits with `code`. */
export async function exitAfterOutput(code: number, streams: OutputStream[] = [process.stdout, process.stderr]): Promise<never> {
  await Promise.all(streams.map(outputDrained));
  process.exit(code);
}
