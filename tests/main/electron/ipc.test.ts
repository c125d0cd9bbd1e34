// The IPC choke point: only our window's top frame may call, only contract channels exist, payloads are validated.
import { describe, expect, it, vi } from 'vitest';
import { createBenchDispatch } from '../../../main/session/dispatch';
import { createBenchEventHub, type BenchHandlers } from '../../../main/session/handlers';
import { callChannel, callChannels, eventChannel } from '../../../main/electron/channels';
import { handleBenchInvoke, isTrustedSender, setupBenchIpc, type IpcMainLike } from '../../../main/electron/ipc';
import { callNames } from '../../../app/contract';

const rendererBaseUrl = 'file:///opt/rampwright/dist/renderer/';
const ourFrame = { url: 'file:///opt/rampwright/dist/renderer/index.html', parent: null };

/** A service whose setHold really keeps state, so a passing call changes something we can read back. */
function holdingService() {
  let held = false;
  const reached: string[] = [];
  const handlers = new Proxy({} as BenchHandlers, {
    get: (_target, name: string) => async (payload: { held?: boolean }) => {
      reached.push(name);
      if (name === 'setHold') held = payload.held ?? held;
      return { held };
    },
  });
  return { dispatch: createBenchDispatch(handlers), reached, isHeld: () => held };
}

describe('isTrustedSender', () => {
  it('trusts the top frame of our renderer files only', () => {
    expect(isTrustedSender(ourFrame, rendererBaseUrl)).toBe(true);
    expect(isTrustedSender({ url: 'file:///opt/rampwright/dist/renderer/index.html#/bench', parent: null }, rendererBaseUrl)).toBe(true);
  });

  it('refuses sub-frames, other files, other schemes and no frame', () => {
    expect(isTrustedSender({ ...ourFrame, parent: {} }, rendererBaseUrl)).toBe(false);
    expect(isTrustedSender({ url: 'file:///home/someone/Downloads/page.html', parent: null }, rendererBaseUrl)).toBe(false);
    expect(isTrustedSender({ url: 'file:///opt/rampwright/dist/renderer-evil/index.html', parent: null }, rendererBaseUrl)).toBe(false);
    expect(isTrustedSender({ url: 'https://example.com/dist/renderer/index.html', parent: null }, rendererBaseUrl)).toBe(false);
    expect(isTrustedSender({ url: 'not a url', parent: null }, rendererBaseUrl)).toBe(false);
    expect(isTrustedSender(null, rendererBaseUrl)).toBe(false);
  });
});

describe('handleBenchInvoke', () => {
  it('passes a valid call from our frame to the service', async () => {
    const service = holdingService();
    const outcome = await handleBenchInvoke(callChannel('setHold'), { senderFrame: ourFrame }, { held: true }, { dispatch: service.dispatch, rendererBaseUrl });
    expect(outcome).toEqual({ ok: true, result: { held: true } });
    expect(service.isHeld()).toBe(true);
  });

  it('refuses an unknown channel without reaching the service', async () => {
    const service = holdingService();
    const outcome = await handleBenchInvoke('rampwright:call:formatDisk', { senderFrame: ourFrame }, {}, { dispatch: service.dispatch, rendererBaseUrl });
    expect(outcome).toMatchObject({ ok: false, error: { kind: 'expected', code: 'unknown-call' } });
    const other = await handleBenchInvoke('some-other-channel', { senderFrame: ourFrame }, {}, { dispatch: service.dispatch, rendererBaseUrl });
    expect(other).toMatchObject({ ok: false, error: { code: 'unknown-call' } });
    expect(service.reached).toEqual([]);
  });

  it('refuses a foreign sender frame without reaching the service', async () => {
    const service = holdingService();
    const outcome = await handleBenchInvoke(callChannel('setHold'), { senderFrame: { url: 'https://example.com/', parent: null } }, { held: true }, { dispatch: service.dispatch, rendererBaseUrl });
    expect(outcome).toMatchObject({ ok: false, error: { code: 'not-allowed' } });
    expect(service.isHeld()).toBe(false);
    expect(service.reached).toEqual([]);
  });

  it('refuses a malformed payload with the field named, without reaching the service', async () => {
    const service = holdingService();
    const outcome = await handleBenchInvoke(callChannel('setHold'), { senderFrame: ourFrame }, { held: 'yes' }, { dispatch: service.dispatch, rendererBaseUrl });
    expect(outcome).toMatchObject({ ok: false, error: { kind: 'expected', code: 'invalid-payload' } });
    expect(outcome.ok ? '' : outcome.error.message).toContain('held');
    expect(service.reached).toEqual([]);
  });
});

describe('setupBenchIpc', () => {
  it('registers exactly one handler per contract call, forwards events to live windows, and undoes both', async () => {
    const registered = new Map<string, Parameters<IpcMainLike['handle']>[1]>();
    const ipcMain: IpcMainLike = { handle: (channel, listener) => registered.set(channel, listener), removeHandler: (channel) => registered.delete(channel) };
    const hub = createBenchEventHub();
    const sent: unknown[] = [];
    const live = { send: vi.fn((...args: unknown[]) => sent.push(args)), isDestroyed: () => false };
    const closed = { send: vi.fn(), isDestroyed: () => true };
    const service = holdingService();
    const teardown = setupBenchIpc({ ipcMain, dispatch: service.dispatch, events: hub, rendererBaseUrl, targets: () => [live, closed] });

    expect([...registered.keys()].sort()).toEqual([...callChannels].sort());
    expect(registered.size).toBe(callNames.length);
    const outcome = await registered.get(callChannel('setHold'))!({ senderFrame: ourFrame }, { held: true });
    expect(outcome).toEqual({ ok: true, result: { held: true } });

    hub.emit('notice', { level: 'info', message: 'link reopened' });
    expect(sent).toEqual([[eventChannel, { event: 'notice', data: { level: 'info', message: 'link reopened' } }]]);
    expect(closed.send).not.toHaveBeenCalled();

    teardown();
    expect(registered.size).toBe(0);
    hub.emit('notice', { level: 'info', message: 'after teardown' });
    expect(sent).toHaveLength(1);
  });
});
