/**
 * The main side of IPC: one handler per contract call, each checking who sent it (our window's top frame, loaded
 * from our own renderer files) and passing the payload through the contract's validating dispatch. Events go to
 * every trusted window. Plain functions plus `setupBenchIpc`, so all of it is tested without Electron.
 */
import type { CallOutcome } from '../../app/contract';
import type { BenchDispatch } from '../session/dispatch';
import type { BenchEventSource } from '../session/handlers';
import { callChannels, callOfChannel, eventChannel } from './channels';

/** What an IPC handler needs of the sending frame (Electron's WebFrameMain). */
export interface SenderFrameFacts {
  url: string;
  /** The top frame has no parent; a sub-frame (an iframe) never calls the bench. */
  parent: unknown;
}

export interface IpcInvokeEventLike {
  senderFrame: SenderFrameFacts | null;
}

/** The parts of ipcMain used here. */
export interface IpcMainLike {
  handle(channel: string, listener: (event: IpcInvokeEventLike, payload: unknown) => Promise<unknown>): void;
  removeHandler(channel: string): void;
}

export interface WebContentsLike {
  send(channel: string, ...args: unknown[]): void;
  isDestroyed(): boolean;
}

/**
 * A frame is ours when it is a top frame whose URL is inside the renderer folder's file URL
 * (`file:///.../dist/renderer/`), with no query tricks on another scheme.
 */
export function isTrustedSender(frame: SenderFrameFacts | null, rendererBaseUrl: string): boolean {
  if (!frame || frame.parent) return false;
  let url: URL;
  let base: URL;
  try {
    url = new URL(frame.url);
    base = new URL(rendererBaseUrl.endsWith('/') ? rendererBaseUrl : `${rendererBaseUrl}/`);
  } catch {
    return false;
  }
  return url.protocol === base.protocol && url.host === base.host && url.pathname.startsWith(base.pathname);
}

function refused(message: string, code: 'not-allowed' | 'unknown-call'): CallOutcome<never> {
  return { ok: false, error: { kind: 'expected', code, message, where: null } };
}

/** Handles one invoke on any channel: unknown channels, foreign frames and malformed payloads are refused. */
export async function handleBenchInvoke(channel: string, event: IpcInvokeEventLike, payload: unknown, options: { dispatch: BenchDispatch; rendererBaseUrl: string }): Promise<CallOutcome<unknown>> {
  const call = callOfChannel(channel);
  if (!call) return refused(`there is no bench channel named ${JSON.stringify(channel).slice(0, 80)}`, 'unknown-call');
  if (!isTrustedSender(event.senderFrame, options.rendererBaseUrl)) return refused('bench calls are only taken from Rampwright\'s own window', 'not-allowed');
  return options.dispatch(call, payload);
}

export interface BenchIpcOptions {
  ipcMain: IpcMainLike;
  dispatch: BenchDispatch;
  events: BenchEventSource;
  /** File URL of the renderer folder, e.g. `file:///opt/rampwright/dist/renderer/`. */
  rendererBaseUrl: string;
  /** The windows that receive events (read on every event, so closed windows drop out). */
  targets: () => readonly WebContentsLike[];
}

/** Registers a handler per contract call and forwards events; returns a function that undoes both. */
export function setupBenchIpc(options: BenchIpcOptions): () => void {
  for (const channel of callChannels) {
    options.ipcMain.handle(channel, (event, payload) => handleBenchInvoke(channel, event, payload, options));
  }
  const stopEvents = options.events.onEvent((event, data) => {
    for (const target of options.targets()) {
      if (!target.isDestroyed()) target.send(eventChannel, { event, data });
    }
  });
  return () => {
    stopEvents();
    for (const channel of callChannels) options.ipcMain.removeHandler(channel);
  };
}
