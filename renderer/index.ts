/**
 * The screens' entry point (bundled to dist/renderer/index.js). Gets the bench client (preload bridge or the server
 * the page came from), builds the five screens inside the shell and opens on the Bench screen.
 */
import { connectClient } from './client/connectClient';
import { h, fill } from './dom/h';
import { BenchScreen } from './screens/benchScreen';
import { BoardScreen } from './screens/boardScreen';
import { LogbookScreen } from './screens/logbookScreen';
import { TransferScreen } from './screens/transferScreen';
import { TrimScreen } from './screens/trimScreen';
import { Notices } from './shell/notices';
import type { ScreenContext } from './shell/screen';
import { Shell } from './shell/shell';
import { BenchStore } from './shell/store';
import { applyTheme, initialTheme } from './shell/theme';

async function start(): Promise<void> {
  const root = document.getElementById('app');
  if (!root) throw new Error('index.html has no #app element');
  applyTheme(initialTheme());
  const client = connectClient();
  const store = new BenchStore(client);
  const notices = new Notices();
  let shell: Shell | null = null;
  const context: ScreenContext = { client, store, notices, go: (screen) => shell?.show(screen) };
  const bench = new BenchScreen(context);
  const screens = [new BoardScreen(context), bench, new TransferScreen(context), new TrimScreen(context), new LogbookScreen(context)];
  shell = new Shell(context, store, screens, { checkStep: () => bench.checkSelected(), toggleHold: () => bench.toggleHold(), keepCapture: () => bench.keepCapture() });
  client.subscribe('notice', (notice) => notices.show(notice.level, notice.message));
  // The desktop shell's own menu (browser mode never sends these).
  client.subscribe('menuCommand', (command) => {
    if (command.command === 'show-screen') shell?.show(command.screen);
    else shell?.showSafetyNote();
  });
  store.connectEvents();
  fill(root, shell.element);
  root.setAttribute('aria-busy', 'false');
  try {
    await store.refresh();
  } catch (error) {
    notices.fromError(error);
  }
  shell.show('bench');
}

start().catch((error: unknown) => {
  const root = document.getElementById('app');
  const message = error instanceof Error ? error.message : String(error);
  if (root) fill(root, h('div', { class: 'panel', role: 'alert' }, h('h1', {}, 'Rampwright could not start'), h('p', {}, message)));
  console.error(error);
});
