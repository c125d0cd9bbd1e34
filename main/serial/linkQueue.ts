/**
 * Between the port and its consumer: a bounded queue read through an async iterator. The port side never waits.
 * When the consumer falls behind and `capacityLines` lines are waiting, newly arrived lines are dropped and counted,
 * and a `lines-dropped` event takes their place in the stream once there is room, so the consumer learns where the
 * hole is. We drop rather than pause the port: a paused USB CDC port only moves the overflow into the logger,
 * whose own buffer is far smaller, and the logger protocol's sequence numbers show the gap to the decoder either way.
 * Link events are never dropped (they are few: at most one per line, and most far rarer).
 */
export interface LinkQueue<Line, Event> {
  pushLine(line: Line): void;
  pushEvent(event: Event): void;
  end(): void;
  next(): Promise<IteratorResult<Line | Event>>;
  queuedLines(): number;
  droppedLines(): number;
}

export function createLinkQueue<Line, Event>(capacityLines: number, droppedEvent: (count: number) => Event): LinkQueue<Line, Event> {
  let items: Array<{ line: true; value: Line } | { line: false; value: Event }> = [];
  let head = 0;
  let lines = 0;
  let droppedSinceReport = 0;
  let droppedTotal = 0;
  let ended = false;
  let waiting: ((result: IteratorResult<Line | Event>) => void) | null = null;

  const deliver = (): void => {
    if (!waiting) return;
    if (head < items.length) {
      const item = items[head];
      head += 1;
      if (item.line) lines -= 1;
      if (head > 1024 && head * 2 > items.length) {
        items = items.slice(head);
        head = 0;
      }
      const resolve = waiting;
      waiting = null;
      resolve({ value: item.value, done: false });
    } else if (ended) {
      const resolve = waiting;
      waiting = null;
      resolve({ value: undefined, done: true });
    }
  };

  const reportDrops = (): void => {
    if (droppedSinceReport === 0) return;
    items.push({ line: false, value: droppedEvent(droppedSinceReport) });
    droppedSinceReport = 0;
  };

  return {
    pushLine(line) {
      if (ended) return;
      if (lines >= capacityLines) {
        droppedSinceReport += 1;
        droppedTotal += 1;
        return;
      }
      reportDrops();
      items.push({ line: true, value: line });
      lines += 1;
      deliver();
    },
    pushEvent(event) {
      if (ended) return;
      reportDrops();
      items.push({ line: false, value: event });
      deliver();
    },
    end() {
      if (ended) return;
      reportDrops();
      ended = true;
      deliver();
    },
    next() {
      if (waiting) throw new Error('the link has one reader: wait for the previous next() first');
      return new Promise((resolve) => {
        waiting = resolve;
        deliver();
      });
    },
    queuedLines: () => lines,
    droppedLines: () => droppedTotal,
  };
}
