/**
 * Opening the logger port: every way it can fail gets a LinkError (an InputError) naming the device and saying what
 * to do. Real devices where the machine allows: socat pseudo-terminals, a file, a folder, and an unprivileged user.
 */
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { chmodSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../../app/errors';
import { LinkError, linkErrorFromMessage } from '../../../main/serial/linkErrors';
import { openLoggerLink, type LoggerLink } from '../../../main/serial/loggerLink';
import { listPorts, portInfoFrom, sameUsbDevice } from '../../../main/serial/listPorts';
import { copyPackageClosure } from '../../helpers/packageCopy';
import { startPtyPair, type PtyPair } from '../../helpers/socat';

let folder: string;
let pair: PtyPair;

beforeAll(async () => {
  folder = mkdtempSync(join(tmpdir(), 'rampwright-open-'));
  chmodSync(folder, 0o755); // the unprivileged case must be able to reach the links
  pair = await startPtyPair(join(folder, 'host'), join(folder, 'logger'));
});
afterAll(async () => {
  await pair.stop();
  rmSync(folder, { recursive: true, force: true });
});

async function refusal(path: string): Promise<LinkError> {
  try {
    const link = await openLoggerLink({ path, noDataTimeoutMs: 0 });
    await link.close();
  } catch (error) {
    expect(error).toBeInstanceOf(LinkError);
    expect(error).toBeInstanceOf(InputError);
    return error as LinkError;
  }
  throw new Error(`${path} opened`);
}

describe('opening the logger port', () => {
  it('names a device that does not exist and asks whether the logger is plugged in', async () => {
    const error = await refusal(join(folder, 'ttyACM7'));
    expect(error.kind).toBe('not-found');
    expect(error.message).toContain(join(folder, 'ttyACM7'));
    expect(error.message).toMatch(/plugged in/);
    // It says which ports there are, so the right one can be given at once (this machine's list, or that it has none).
    const listed = await listPorts();
    if (listed.length === 0) expect(error.message).toMatch(/No serial ports were found/);
    else expect(error.message).toContain(`Serial ports here: ${listed[0].path}`);
  });

  it('says the port is busy when another program holds it', async () => {
    const first: LoggerLink = await openLoggerLink({ path: pair.hostPath, noDataTimeoutMs: 0 });
    try {
      const error = await refusal(pair.hostPath);
      expect(error.kind).toBe('busy');
      expect(error.message).toContain(pair.hostPath);
      expect(error.message).toMatch(/another program/);
    } finally {
      await first.close();
    }
    // Once released, it opens.
    const again = await openLoggerLink({ path: pair.hostPath, noDataTimeoutMs: 0 });
    await again.close();
  });

  it('refuses a plain file, a folder and an empty path as bad paths', async () => {
    const file = join(folder, 'capture.csv');
    writeFileSync(file, 't,sync\n');
    expect((await refusal(file)).kind).toBe('not-a-serial-device');
    expect((await refusal(folder)).kind).toBe('bad-path');
    const empty = await refusal('');
    expect(empty.kind).toBe('bad-path');
    expect(empty.message).toMatch(/no serial device given/);
  });

  it('tells an unprivileged user on Linux to join the dialout group, naming the device', async () => {
    const script = join(folder, 'openErrorChild.cjs');
    await build({ entryPoints: [resolve(__dirname, 'openErrorChild.ts')], outfile: script, bundle: true, platform: 'node', format: 'cjs', external: ['serialport'], logLevel: 'error' });
    chmodSync(script, 0o644);
    // The child runs as another user, who may not be able to enter the folder this checkout sits in (a clone under a
    // private temporary folder): serialport and what it needs (its native binding included) go beside the script.
    copyPackageClosure('serialport', resolve(__dirname, '../../..'), join(folder, 'node_modules'));
    // setpriv (util-linux) drops to user "nobody"; the pty is root's with mode 600, so the open fails with EACCES.
    const result = spawnSync('setpriv', ['--reuid=65534', '--regid=65534', '--clear-groups', process.execPath, script, pair.hostPath], {
      encoding: 'utf8',
      cwd: folder,
      env: { ...process.env, NODE_PATH: join(folder, 'node_modules') },
      timeout: 20_000,
    });
    if (result.error || process.getuid?.() !== 0) {
      // Not root here: the running user is the unprivileged one, so the same refusal shows on our own pty only if
      // its mode forbids us; check the words from the binding's message instead.
      const error = linkErrorFromMessage('/dev/ttyUSB0', 'Error: Permission denied, cannot open /dev/ttyUSB0', { platform: 'linux' });
      expect(error.message).toMatch(/dialout/);
      return;
    }
    expect(result.stderr, 'the child, run as nobody, must start and answer').toBe('');
    const outcome = JSON.parse(result.stdout) as { opened: boolean; kind?: string; message?: string };
    expect(outcome.opened).toBe(false);
    expect(outcome.kind).toBe('permission-denied');
    expect(outcome.message).toContain(pair.hostPath);
    expect(outcome.message).toMatch(/"dialout"/);
  });

  it('words permission faults for each platform from the binding messages', () => {
    // Message texts of @serialport/bindings-cpp (Linux, macOS) and of Windows' CreateFile failure.
    expect(linkErrorFromMessage('/dev/cu.usbmodem1', 'Error: Permission denied, cannot open /dev/cu.usbmodem1', { platform: 'darwin' }).message).toMatch(/ls -l/);
    // Windows answers "Access denied" when another program has the COM port open (from memory).
    expect(linkErrorFromMessage('COM3', 'Opening COM3: Access denied', { platform: 'win32' }).kind).toBe('busy');
    expect(linkErrorFromMessage('COM9', 'Opening COM9: File not found', { platform: 'win32' }).kind).toBe('not-found');
    expect(linkErrorFromMessage('/dev/ttyS0', 'Error: Input/output error', { platform: 'linux' }).kind).toBe('io');
  });
});

describe('port identity', () => {
  it('normalises USB ids and recognises the same device on another path', () => {
    const before = portInfoFrom({ path: '/dev/ttyACM0', vendorId: '2E8A', productId: '000a', serialNumber: 'E660583883', manufacturer: 'Bench logger' });
    const after = portInfoFrom({ path: '/dev/ttyACM1', vendorId: '2e8a', productId: '0x000A', serialNumber: 'E660583883' });
    expect(before).toMatchObject({ vendorId: '2e8a', productId: '000a' });
    expect(sameUsbDevice(before, after)).toBe(true);
    expect(sameUsbDevice(before, { ...after, serialNumber: 'E660583884' })).toBe(false);
    expect(sameUsbDevice(portInfoFrom({ path: '/dev/ttyS0' }), portInfoFrom({ path: '/dev/ttyS0' }))).toBe(false);
  });

  it('lists the ports of this machine (udev on Linux) with ids normalised or null', async () => {
    const ports = await listPorts();
    expect(Array.isArray(ports)).toBe(true);
    for (const port of ports) {
      expect(port.path).toMatch(/^(\/dev\/|COM)/);
      for (const id of [port.vendorId, port.productId]) if (id !== null) expect(id).toMatch(/^[0-9a-f]{4}$/);
    }
    // socat's pseudo-terminals are not serial hardware: the list does not offer them.
    expect(ports.some((port) => port.path === pair.hostPath)).toBe(false);
  });
});
