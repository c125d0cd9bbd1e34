/** What a screen is to the shell: an element, told when it is shown and when the theme changes. */
import type { BenchClient } from '../../app/contract/index';
import type { ScreenName } from '../shaping/shortcuts';
import type { Notices } from './notices';
import type { BenchStore } from './store';

export interface ScreenContext {
  client: BenchClient;
  store: BenchStore;
  notices: Notices;
  go(screen: ScreenName): void;
}

export interface Screen {
  readonly name: ScreenName;
  readonly title: string;
  readonly element: HTMLElement;
  shown(): void;
  restyle(): void;
}

/** Run a call from a button: disable it while running, report a failure as a notice. Never leaves a dead button. */
export async function runAction<T>(context: ScreenContext, button: HTMLButtonElement | null, action: () => Promise<T>): Promise<T | undefined> {
  if (button) button.disabled = true;
  try {
    return await action();
  } catch (error) {
    context.notices.fromError(error);
    return undefined;
  } finally {
    if (button) button.disabled = false;
  }
}
