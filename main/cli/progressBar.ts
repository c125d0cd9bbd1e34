/**
 * A progress bar for long captures on the command line. It draws only on a terminal (stderr a TTY) and only when
 * asked (never under --json): a pipe or a log file gets the result alone. Redrawn at most ten times a second on one
 * line, cleared when done; Ctrl-C while it runs clears it and says the reading was cancelled (exit 130, the shell's
 * code for an interrupt).
 */
export interface ProgressBar {
  /** Work done of the total (bytes of the file). */
  update: (done: number, total: number) => void;
  /** Clears the bar (safe to call twice, and when it never drew). */
  done: () => void;
}

export interface ProgressBarOptions {
  enabled: boolean;
  label: string;
  minIntervalMs?: number;
  now?: () => number;
}

interface TerminalStream {
  isTTY?: boolean;
  columns?: number;
  write(text: string): boolean;
}

function mebibytes(bytes: number): string {
  return bytes >= 10 * (1 << 20) ? `${(bytes / (1 << 20)).toFixed(0)} MiB` : `${(bytes / (1 << 20)).toFixed(1)} MiB`;
}

function clock(seconds: number): string {
  const whole = Math.max(0, Math.round(seconds));
  return `${Math.floor(whole / 60)}:${String(whole % 60).padStart(2, '0')}`;
}

/** The bar's text for a width of `columns` characters. */
export function progressLine(label: string, done: number, total: number, elapsedS: number, columns: number): string {
  const fraction = total > 0 ? Math.min(1, Math.max(0, done / total)) : 0;
  const percent = `${Math.floor(fraction * 100)}%`.padStart(4);
  const left = fraction > 0.02 && fraction < 1 ? `, ${clock((elapsedS * (1 - fraction)) / fraction)} left` : '';
  const tail = ` ${percent}  ${mebibytes(done)} of ${mebibytes(total)}${left}`;
  const width = Math.max(10, Math.min(40, columns - label.length - tail.length - 4));
  const filled = Math.round(fraction * width);
  return `${label} [${'#'.repeat(filled)}${'.'.repeat(width - filled)}]${tail}`;
}

export function createProgressBar(stream: TerminalStream, options: ProgressBarOptions): ProgressBar {
  const active = options.enabled && stream.isTTY === true;
  if (!active) return { update: () => undefined, done: () => undefined };
  const now = options.now ?? (() => performance.now());
  const minIntervalMs = options.minIntervalMs ?? 100;
  const startedMs = now();
  let lastDrawMs = Number.NEGATIVE_INFINITY;
  let drawn = false;
  let finished = false;
  const clear = (): void => {
    if (drawn) stream.write('\r\x1b[K');
    drawn = false;
  };
  const onInterrupt = (): void => {
    clear();
    process.stderr.write('rampwright: cancelled\n');
    process.exit(130);
  };
  process.once('SIGINT', onInterrupt);
  return {
    update(done, total) {
      if (finished) return;
      const nowMs = now();
      if (nowMs - lastDrawMs < minIntervalMs && done < total) return;
      lastDrawMs = nowMs;
      stream.write(`\r${progressLine(options.label, done, total, (nowMs - startedMs) / 1000, stream.columns ?? 80)}\x1b[K`);
      drawn = true;
    },
    done() {
      if (finished) return;
      finished = true;
      process.removeListener('SIGINT', onInterrupt);
      clear();
    },
  };
}
