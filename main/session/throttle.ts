/**
 * At most one live frame per interval to the screens (about 20 a second by default): a screen redraws at 60 Hz
 * at best, and 20 fold updates a second look continuous while leaving the link and the logbook most of the time.
 * The latest frame wins; intermediate ones are dropped, never queued.
 */
export interface Throttle<Value> {
  offer(value: Value): void;
  /** Sends a pending value now (e.g. at the end of a run). */
  flush(): void;
  stop(): void;
}

export interface ClockLike {
  now(): number;
  setTimeout(callback: () => void, delayMs: number): unknown;
  clearTimeout(handle: unknown): void;
}

export const systemClock: ClockLike = {
  now: () => Date.now(),
  setTimeout: (callback, delayMs) => setTimeout(callback, delayMs),
  clearTimeout: (handle) => clearTimeout(handle as ReturnType<typeof setTimeout>),
};

export function createThrottle<Value>(send: (value: Value) => void, intervalMs: number, clock: ClockLike = systemClock): Throttle<Value> {
  let lastSentMs = Number.NEGATIVE_INFINITY;
  let pending: { value: Value } | null = null;
  let timer: unknown = null;
  const fire = () => {
    timer = null;
    if (!pending) return;
    const { value } = pending;
    pending = null;
    lastSentMs = clock.now();
    send(value);
  };
  return {
    offer(value) {
      pending = { value };
      const waitMs = lastSentMs + intervalMs - clock.now();
      if (waitMs <= 0) {
        if (timer !== null) clock.clearTimeout(timer);
        fire();
      } else if (timer === null) {
        timer = clock.setTimeout(fire, waitMs);
      }
    },
    flush() {
      if (timer !== null) clock.clearTimeout(timer);
      fire();
    },
    stop() {
      if (timer !== null) clock.clearTimeout(timer);
      timer = null;
      pending = null;
    },
  };
}
