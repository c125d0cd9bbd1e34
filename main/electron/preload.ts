/**
 * The preload (sandboxed, context-isolated): exposes `window.rampwright` with one function per contract call and
 * `subscribe` for events, nothing else. No Node, no ipcRenderer, no raw channels reach the page.
 */
import { contextBridge, ipcRenderer, type IpcRendererEvent } from 'electron';
// Names only (no schemas): the sandboxed preload stays small; main validates every payload anyway.
import { benchCallNames as callNames, isBenchEventName as isEventName } from '../../app/contract/names';
import type { CallOutcome } from '../../app/contract/errors';
import { bridgeName, callChannel, eventChannel } from './channels';

export function buildBridge(renderer: Pick<typeof ipcRenderer, 'invoke' | 'on' | 'removeListener'>): Record<string, unknown> {
  const bridge: Record<string, unknown> = {};
  for (const name of callNames) {
    bridge[name] = (payload: unknown): Promise<CallOutcome<unknown>> => renderer.invoke(callChannel(name), payload ?? {}) as Promise<CallOutcome<unknown>>;
  }
  bridge.subscribe = (event: unknown, handler: unknown): (() => void) => {
    if (!isEventName(event) || typeof handler !== 'function') throw new TypeError('subscribe(event, handler) needs a bench event name and a function');
    const listener = (_sender: IpcRendererEvent, message: { event?: unknown; data?: unknown }) => {
      if (message && message.event === event) (handler as (data: unknown) => void)(message.data);
    };
    renderer.on(eventChannel, listener);
    return () => {
      renderer.removeListener(eventChannel, listener);
    };
  };
  return bridge;
}

contextBridge.exposeInMainWorld(bridgeName, buildBridge(ipcRenderer));
