/**
 * The logger's port offered first: a port on a USB-serial bridge loggers are built on is recognised by its USB ids
 * (usbBridges.ts: ids are facts of the trade, from memory) and sorted ahead of other ports.
 */
import { describe, expect, it } from 'vitest';
import { loggerPortsFirst, portInfoFrom } from '../../../main/serial/listPorts';
import { loggerBridgeOf, loggerBridges } from '../../../main/serial/usbBridges';

describe('logger bridge recognition', () => {
  it('recognises a bridge by vendor and product id, whatever case or prefix the platform writes them in', () => {
    const port = portInfoFrom({ path: '/dev/ttyUSB0', vendorId: '1A86', productId: '0x7523', manufacturer: 'someone' });
    expect(port.loggerBridge).toBe('USB-serial bridge');
    expect(portInfoFrom({ path: '/dev/ttyACM0', vendorId: '2341', productId: '0043' }).loggerBridge).toBe('8-bit board USB bridge');
  });

  it('does not recognise another product of a bridge maker, another vendor, or a port without USB ids', () => {
    expect(portInfoFrom({ path: '/dev/ttyUSB1', vendorId: '1a86', productId: 'e008' }).loggerBridge).toBeNull();
    expect(portInfoFrom({ path: '/dev/ttyACM1', vendorId: '2e8a', productId: '000a' }).loggerBridge).toBeNull();
    expect(portInfoFrom({ path: '/dev/ttyS0' }).loggerBridge).toBeNull();
    expect(loggerBridgeOf({ vendorId: null, productId: null })).toBeNull();
  });

  it('keeps its table well formed: four lower-case hex digits, no id listed twice', () => {
    const keys = loggerBridges.map((bridge) => `${bridge.vendorId}:${bridge.productId ?? '*'}`);
    expect(new Set(keys).size).toBe(keys.length);
    for (const bridge of loggerBridges) {
      expect(bridge.vendorId).toMatch(/^[0-9a-f]{4}$/);
      if (bridge.productId !== null) expect(bridge.productId).toMatch(/^[0-9a-f]{4}$/);
    }
  });

  it('lists likely loggers first, then other USB ports, then the rest, by path within each', () => {
    const ports = [
      portInfoFrom({ path: '/dev/ttyS0' }),
      portInfoFrom({ path: '/dev/ttyACM3', vendorId: '2e8a', productId: '000a' }),
      portInfoFrom({ path: '/dev/ttyUSB2', vendorId: '10c4', productId: 'ea60' }),
      portInfoFrom({ path: '/dev/ttyACM0', vendorId: '2a03', productId: '0043' }),
    ];
    expect(loggerPortsFirst(ports).map((port) => port.path)).toEqual(['/dev/ttyACM0', '/dev/ttyUSB2', '/dev/ttyACM3', '/dev/ttyS0']);
  });
});
