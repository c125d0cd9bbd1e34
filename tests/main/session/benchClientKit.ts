/**
 * A bench context over a logbook file with a contract client on it, as the screens have one: every call goes
 * through the dispatcher with results checked against the contract's schemas (a mismatch comes back as a bug),
 * events through the service's hub. The virtual board is pumped, not paced.
 */
import { createBenchClient, type BenchClient } from '../../../app/contract';
import { openBenchContext, type BenchContext } from '../../../main/session/benchContext';
import { createBenchDispatch } from '../../../main/session/dispatch';

export interface TestBench {
  context: BenchContext;
  client: BenchClient;
  /** Runs the virtual board for this many seconds of signal, at once. */
  pump(seconds: number): void;
}

export async function openTestBench(logbookPath: string): Promise<TestBench> {
  const context = await openBenchContext({ logbookPath, virtualPaced: false });
  const dispatch = createBenchDispatch(context.service.handlers, { checkResults: true });
  const client = createBenchClient({ invoke: dispatch, subscribe: (event, handler) => context.service.events.onEvent((name, data) => name === event && handler(data)) });
  const pump = (seconds: number): void => {
    const virtual = context.service.virtual();
    if (!virtual) throw new Error('no virtual board is connected');
    virtual.pump(seconds);
  };
  return { context, client, pump };
}
