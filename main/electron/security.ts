/**
 * Secure defaults for the one window (Electron's security checklist, common practice): context isolation,
 * sandbox, no Node in the page, a strict content security policy, no navigation away, no new windows, no
 * permission prompts granted. Plain functions over the few Electron methods they use, tested without Electron.
 */
import { pathToFileURL } from 'node:url';

/** The page's policy: our own files only; the desktop build talks over IPC, so no network at all. */
export const desktopContentSecurityPolicy =
  "default-src 'none'; script-src 'self'; style-src 'self' 'unsafe-inline'; img-src 'self' data: blob:; font-src 'self'; connect-src 'none'; object-src 'none'; base-uri 'none'; form-action 'none'; frame-src 'none'; frame-ancestors 'none'";

export function secureWebPreferences(preloadPath: string) {
  return {
    preload: preloadPath,
    contextIsolation: true,
    sandbox: true,
    nodeIntegration: false,
    nodeIntegrationInWorker: false,
    nodeIntegrationInSubFrames: false,
    webSecurity: true,
    allowRunningInsecureContent: false,
    experimentalFeatures: false,
    webviewTag: false,
    spellcheck: false,
    navigateOnDragDrop: false,
  } as const;
}

export function rendererBaseUrlOf(rendererFolder: string): string {
  const url = pathToFileURL(rendererFolder).href;
  return url.endsWith('/') ? url : `${url}/`;
}

/** Navigation is allowed only within our own renderer files (a reload or an in-page anchor). */
export function isAllowedNavigation(targetUrl: string, rendererBaseUrl: string): boolean {
  try {
    const target = new URL(targetUrl);
    const base = new URL(rendererBaseUrl);
    return target.protocol === 'file:' && base.protocol === 'file:' && target.pathname.startsWith(base.pathname);
  } catch {
    return false;
  }
}

interface PreventableEvent {
  preventDefault(): void;
}

export interface WebContentsSecurityLike {
  setWindowOpenHandler(handler: (details: { url: string }) => { action: 'deny' }): void;
  on(event: 'will-navigate' | 'will-redirect' | 'will-attach-webview', listener: (event: PreventableEvent, url: string) => void): unknown;
}

export interface SessionSecurityLike {
  setPermissionRequestHandler(handler: ((webContents: unknown, permission: string, callback: (granted: boolean) => void) => void) | null): void;
  setPermissionCheckHandler?(handler: ((webContents: unknown, permission: string) => boolean) | null): void;
  webRequest: {
    onHeadersReceived(listener: (details: { responseHeaders?: Record<string, string[]> }, callback: (response: { responseHeaders?: Record<string, string[]> }) => void) => void): void;
  };
}

/** Denies new windows, navigation outside our files and webviews. */
export function lockDownWebContents(contents: WebContentsSecurityLike, rendererBaseUrl: string): void {
  contents.setWindowOpenHandler(() => ({ action: 'deny' }));
  const guard = (event: PreventableEvent, url: string) => {
    if (!isAllowedNavigation(url, rendererBaseUrl)) event.preventDefault();
  };
  contents.on('will-navigate', guard);
  contents.on('will-redirect', guard);
  contents.on('will-attach-webview', (event) => event.preventDefault());
}

/** Grants no permission (camera, notifications, serial from the page...) and sets the CSP on every response. */
export function lockDownSession(session: SessionSecurityLike): void {
  session.setPermissionRequestHandler((_contents, _permission, callback) => callback(false));
  session.setPermissionCheckHandler?.(() => false);
  session.webRequest.onHeadersReceived((details, callback) => {
    callback({ responseHeaders: { ...(details.responseHeaders ?? {}), 'Content-Security-Policy': [desktopContentSecurityPolicy] } });
  });
}
