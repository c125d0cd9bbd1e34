// Secure defaults of the window, the menu of our own and the persisted window state, without the Electron binary.
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { desktopContentSecurityPolicy, isAllowedNavigation, lockDownSession, lockDownWebContents, rendererBaseUrlOf, secureWebPreferences } from '../../../main/electron/security';
import { buildMenuTemplate, type MenuItemTemplate, type ScreenName } from '../../../main/electron/menu';
import { loadWindowState, parseWindowState, placeWindowState, saveWindowState } from '../../../main/electron/windowState';

const base = 'file:///opt/rampwright/dist/renderer/';

describe('window security', () => {
  it('turns on isolation and sandbox and turns off Node in every kind of frame (Electron security checklist, common practice)', () => {
    const preferences = secureWebPreferences('/opt/rampwright/dist/electron/preload.cjs');
    expect(preferences).toMatchObject({ contextIsolation: true, sandbox: true, nodeIntegration: false, nodeIntegrationInSubFrames: false, nodeIntegrationInWorker: false, webviewTag: false, webSecurity: true });
  });

  it('denies new windows, navigation away and webviews', () => {
    const handlers: Record<string, (event: { preventDefault(): void }, url: string) => void> = {};
    let openHandler: ((details: { url: string }) => { action: 'deny' }) | null = null;
    lockDownWebContents({ setWindowOpenHandler: (handler) => (openHandler = handler), on: (name, listener) => (handlers[name] = listener) }, base);
    expect(openHandler!({ url: 'https://example.com/' })).toEqual({ action: 'deny' });
    const outcome = (name: string, url: string) => {
      let prevented = false;
      handlers[name]({ preventDefault: () => (prevented = true) }, url);
      return prevented;
    };
    expect(outcome('will-navigate', 'https://example.com/')).toBe(true);
    expect(outcome('will-navigate', 'file:///etc/passwd')).toBe(true);
    expect(outcome('will-redirect', 'http://127.0.0.1:9/')).toBe(true);
    expect(outcome('will-navigate', `${base}index.html`)).toBe(false);
    expect(outcome('will-attach-webview', 'anything')).toBe(true);
  });

  it('grants no permission and puts the strict CSP on every response', () => {
    let permission: ((contents: unknown, name: string, callback: (granted: boolean) => void) => void) | null = null;
    let headers: ((details: { responseHeaders?: Record<string, string[]> }, callback: (response: { responseHeaders?: Record<string, string[]> }) => void) => void) | null = null;
    lockDownSession({ setPermissionRequestHandler: (handler) => (permission = handler), webRequest: { onHeadersReceived: (listener) => (headers = listener) } });
    let granted: boolean | null = null;
    permission!({}, 'serial', (answer) => (granted = answer));
    expect(granted).toBe(false);
    let response: Record<string, string[]> = {};
    headers!({ responseHeaders: { 'X-Other': ['1'] } }, (reply) => (response = reply.responseHeaders ?? {}));
    expect(response['Content-Security-Policy']).toEqual([desktopContentSecurityPolicy]);
    expect(response['X-Other']).toEqual(['1']);
    expect(desktopContentSecurityPolicy).toContain("default-src 'none'");
    expect(desktopContentSecurityPolicy).not.toContain('unsafe-eval');
  });

  it('allows navigation only within the renderer folder', () => {
    expect(rendererBaseUrlOf('/opt/rampwright/dist/renderer')).toBe(base);
    expect(isAllowedNavigation(`${base}index.html#logbook`, base)).toBe(true);
    expect(isAllowedNavigation('file:///opt/rampwright/dist/other.html', base)).toBe(false);
    expect(isAllowedNavigation('javascript:alert(1)', base)).toBe(false);
  });
});

describe('application menu', () => {
  it('offers the five screens with distinct shortcuts and calls back with the screen', () => {
    const shown: ScreenName[] = [];
    const template = buildMenuTemplate(
      { showScreen: (screen) => shown.push(screen), toggleHold: () => undefined, keepCapture: () => undefined, showSafetyNote: () => undefined, openDataFolder: () => undefined, quit: () => undefined },
      { developer: false },
    );
    const screens = template.find((item) => item.label === 'Screens')!.submenu!;
    expect(screens.map((item) => item.label)).toEqual(['Board', 'Bench', 'Transfer', 'Trim', 'Logbook']);
    expect(new Set(screens.map((item) => item.accelerator)).size).toBe(5);
    screens[4].click!();
    expect(shown).toEqual(['logbook']);
  });

  it('has no developer tools in the technician build', () => {
    const roles = (items: MenuItemTemplate[]): string[] => items.flatMap((item) => [item.role ?? '', ...roles(item.submenu ?? [])]);
    const noop = () => undefined;
    const actions = { showScreen: noop, toggleHold: noop, keepCapture: noop, showSafetyNote: noop, openDataFolder: noop, quit: noop };
    expect(roles(buildMenuTemplate(actions, { developer: false }))).not.toContain('toggleDevTools');
    expect(roles(buildMenuTemplate(actions, { developer: true }))).toContain('toggleDevTools');
  });
});

describe('window state', () => {
  let folder = '';
  afterEach(() => folder && rmSync(folder, { recursive: true, force: true }));

  it('comes back as saved when its screen is still attached', () => {
    folder = mkdtempSync(join(tmpdir(), 'rampwright-window-'));
    const file = join(folder, 'sub', 'window-state.json');
    saveWindowState(file, { x: 200, y: 100, width: 1400, height: 900 }, true);
    expect(loadWindowState(file, [{ x: 0, y: 0, width: 1920, height: 1080 }])).toEqual({ x: 200, y: 100, width: 1400, height: 900, maximized: true });
  });

  it('drops a position on a screen that is gone, and falls back on a damaged file', () => {
    expect(placeWindowState({ x: 3000, y: 100, width: 1200, height: 800, maximized: false }, [{ x: 0, y: 0, width: 1920, height: 1080 }])).toEqual({ width: 1200, height: 800, maximized: false });
    folder = mkdtempSync(join(tmpdir(), 'rampwright-window-'));
    const file = join(folder, 'window-state.json');
    writeFileSync(file, '{"width": 12');
    expect(loadWindowState(file, [])).toEqual({ width: 1280, height: 820, maximized: false });
    expect(parseWindowState('{"width": 100, "height": 100}')).toEqual({ width: 1280, height: 820, maximized: false });
  });
});
