// The preload exposes one function per contract call plus subscribe, under one name, and nothing else.
import { beforeEach, describe, expect, it, vi } from 'vitest';

const exposed: Array<{ name: string; api: Record<string, unknown> }> = [];
const invoked: Array<{ channel: string; payload: unknown }> = [];
const listeners = new Map<string, Array<(...args: unknown[]) => void>>();

// Electron is mocked once for this file: the binary is absent in CI and the preload only needs these three.
vi.mock('electron', () => ({
  contextBridge: { exposeInMainWorld: (name: string, api: Record<string, unknown>) => exposed.push({ name, api }) },
  ipcRenderer: {
    invoke: async (channel: string, payload: unknown) => {
      invoked.push({ channel, payload });
      return { ok: true, result: { channel } };
    },
    on: (channel: string, listener: (...args: unknown[]) => void) => listeners.set(channel, [...(listeners.get(channel) ?? []), listener]),
    removeListener: (channel: string, listener: (...args: unknown[]) => void) => listeners.set(channel, (listeners.get(channel) ?? []).filter((l) => l !== listener)),
  },
}));

describe('preload bridge', () => {
  beforeEach(() => {
    invoked.length = 0;
  });

  it('exposes window.rampwright with one function per call plus subscribe', async () => {
    await import('../../../main/electron/preload');
    const { callNames } = await import('../../../app/contract');
    expect(exposed).toHaveLength(1);
    expect(exposed[0].name).toBe('rampwright');
    expect(Object.keys(exposed[0].api).sort()).toEqual([...callNames, 'subscribe'].sort());
  });

  it('sends each call on its own channel and returns the outcome untouched', async () => {
    await import('../../../main/electron/preload');
    const api = exposed[0].api as Record<string, (payload?: unknown) => Promise<unknown>>;
    await expect(api.setHold({ held: true })).resolves.toEqual({ ok: true, result: { channel: 'rampwright:call:setHold' } });
    await api.listPorts();
    expect(invoked).toEqual([
      { channel: 'rampwright:call:setHold', payload: { held: true } },
      { channel: 'rampwright:call:listPorts', payload: {} },
    ]);
  });

  it('subscribe delivers only its event and stops after unsubscribe; unknown events are refused', async () => {
    await import('../../../main/electron/preload');
    const api = exposed[0].api as { subscribe: (event: string, handler: (data: unknown) => void) => () => void };
    const seen: unknown[] = [];
    const stop = api.subscribe('notice', (data) => seen.push(data));
    const fire = (message: unknown) => (listeners.get('rampwright:event') ?? []).forEach((listener) => listener({}, message));
    fire({ event: 'notice', data: { level: 'info', message: 'one' } });
    fire({ event: 'health', data: { state: 'streaming' } });
    stop();
    fire({ event: 'notice', data: { level: 'info', message: 'two' } });
    expect(seen).toEqual([{ level: 'info', message: 'one' }]);
    expect(() => api.subscribe('ipc-internal', () => undefined)).toThrow(TypeError);
  });
});
