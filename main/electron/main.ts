/**
 * The desktop shell (thin): one window with secure defaults, our own menu, the bench API over IPC, the window
 * where the technician left it. All logic lives in plain functions (security.ts, ipc.ts, menu.ts, windowState.ts)
 * and in the session service, which the command line and browser mode share.
 */
import { app, BrowserWindow, ipcMain, Menu, screen, session, shell } from 'electron';
import { homedir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { openBenchContext, type BenchContext } from '../session/benchContext';
import { defaultLogbookFileName, userDataFolder } from '../session/dataFolder';
import { serialAccess } from '../session/serialAccess';
import { recordExporters } from '../session/recordExporters';
import { setupBenchIpc } from './ipc';
import { buildMenuTemplate } from './menu';
import { lockDownSession, lockDownWebContents, rendererBaseUrlOf, secureWebPreferences } from './security';
import { loadWindowState, saveWindowState } from './windowState';

const here = dirname(fileURLToPath(import.meta.url));
const rendererFolder = join(here, '..', 'renderer');
const preloadPath = join(here, 'preload.cjs');
const rendererBaseUrl = rendererBaseUrlOf(rendererFolder);
const dataFolder = userDataFolder({ platform: process.platform, env: process.env, home: homedir() });

let context: BenchContext | null = null;
let mainWindow: BrowserWindow | null = null;

function createWindow(): BrowserWindow {
  const stateFile = join(app.getPath('userData'), 'window-state.json');
  const state = loadWindowState(stateFile, screen.getAllDisplays().map((display) => display.workArea));
  const window = new BrowserWindow({
    x: state.x,
    y: state.y,
    width: state.width,
    height: state.height,
    minWidth: 900,
    minHeight: 600,
    show: false,
    title: 'Rampwright',
    webPreferences: secureWebPreferences(preloadPath),
  });
  if (state.maximized) window.maximize();
  window.once('ready-to-show', () => window.show());
  window.on('close', () => saveWindowState(stateFile, window.getNormalBounds(), window.isMaximized()));
  window.on('closed', () => {
    if (mainWindow === window) mainWindow = null;
  });
  void window.loadFile(join(rendererFolder, 'index.html'));
  return window;
}

function installMenu(bench: BenchContext): void {
  const template = buildMenuTemplate(
    {
      showScreen: (screenName) => bench.service.emit('menuCommand', { command: 'show-screen', screen: screenName }),
      showSafetyNote: () => bench.service.emit('menuCommand', { command: 'show-safety-note' }),
      toggleHold: () => {
        void bench.dispatch('benchState', {}).then((outcome) => {
          const held = outcome.ok && (outcome.result as { held?: boolean }).held === true;
          return bench.dispatch('setHold', { held: !held });
        });
      },
      keepCapture: () => {
        void bench.dispatch('keepCapture', {}).then((outcome) => {
          const message = outcome.ok ? 'the last seconds of samples were kept in the session' : outcome.error.message;
          bench.service.emit('notice', { level: outcome.ok ? 'info' : 'warning', message });
        });
      },
      openDataFolder: () => void shell.openPath(dataFolder),
      quit: () => app.quit(),
    },
    { developer: !app.isPackaged },
  );
  Menu.setApplicationMenu(Menu.buildFromTemplate(template));
}

async function start(): Promise<void> {
  await app.whenReady();
  lockDownSession(session.defaultSession);
  // The bench setting for a line: RAMPWRIGHT_PUSH_TO pushes finished sessions to the shared logbook as it goes.
  const pushTo = process.env.RAMPWRIGHT_PUSH_TO?.trim() || undefined;
  context = await openBenchContext({ logbookPath: join(dataFolder, defaultLogbookFileName), serial: await serialAccess(), exporters: recordExporters, pushTo });
  const bench = context;
  setupBenchIpc({
    ipcMain,
    dispatch: bench.dispatch,
    events: bench.service.events,
    rendererBaseUrl,
    targets: () => BrowserWindow.getAllWindows().map((window) => window.webContents),
  });
  installMenu(bench);
  mainWindow = createWindow();
  app.on('activate', () => {
    if (!mainWindow) mainWindow = createWindow();
  });
}

// Sandbox every renderer, and lock down any web contents before it can load anything.
app.enableSandbox();
app.on('web-contents-created', (_event, contents) => lockDownWebContents(contents, rendererBaseUrl));
if (!app.requestSingleInstanceLock()) {
  app.quit();
} else {
  app.on('second-instance', () => {
    if (mainWindow) {
      if (mainWindow.isMinimized()) mainWindow.restore();
      mainWindow.focus();
    }
  });
  app.on('window-all-closed', () => app.quit());
  app.on('will-quit', (event) => {
    if (!context) return;
    // Close the logbook cleanly (an open session is marked interrupted), then quit for real.
    event.preventDefault();
    const closing = context;
    context = null;
    void closing.close().finally(() => app.exit(0));
  });
  start().catch((error: unknown) => {
    process.stderr.write(`rampwright: the desktop shell could not start: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
    app.exit(1);
  });
}
