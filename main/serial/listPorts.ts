/**
 * The serial ports on this computer, with the USB identity a logger is recognised by when it comes back on another
 * path (SerialPort.list; on Linux it asks udev through `udevadm`). Ports on a USB-serial bridge that loggers are
 * built on (usbBridges.ts) come first and say so, so the logger is the port offered first.
 */
import { SerialPort } from 'serialport';
import { loggerBridgeOf } from './usbBridges';

export interface PortInfo {
  path: string;
  /** USB vendor and product ids as four hex digits, lower case (null for a port that is not USB). */
  vendorId: string | null;
  productId: string | null;
  serialNumber: string | null;
  manufacturer: string | null;
  /** The USB-serial bridge a logger is commonly built on, when the port's ids are one (usbBridges.ts); else null. */
  loggerBridge: string | null;
}

const normalisedId = (value: string | undefined): string | null => (value ? value.toLowerCase().replace(/^0x/, '').padStart(4, '0') : null);

export function portInfoFrom(raw: { path: string; vendorId?: string; productId?: string; serialNumber?: string; manufacturer?: string }): PortInfo {
  const vendorId = normalisedId(raw.vendorId);
  const productId = normalisedId(raw.productId);
  return {
    path: raw.path,
    vendorId,
    productId,
    serialNumber: raw.serialNumber ?? null,
    manufacturer: raw.manufacturer ?? null,
    loggerBridge: loggerBridgeOf({ vendorId, productId })?.description ?? null,
  };
}

/** Likely loggers first (a known bridge), then other USB ports, then the rest; by path within each. */
export function loggerPortsFirst(ports: readonly PortInfo[]): PortInfo[] {
  const rank = (port: PortInfo): number => (port.loggerBridge !== null ? 0 : port.vendorId !== null ? 1 : 2);
  return [...ports].sort((a, b) => rank(a) - rank(b) || a.path.localeCompare(b.path));
}

export async function listPorts(): Promise<PortInfo[]> {
  const ports = await SerialPort.list();
  return loggerPortsFirst(ports.map(portInfoFrom));
}

/** True when two ports are the same USB device (vendor, product and, when both have one, serial number). */
export function sameUsbDevice(a: PortInfo, b: PortInfo): boolean {
  if (a.vendorId === null || a.productId === null) return false;
  if (a.vendorId !== b.vendorId || a.productId !== b.productId) return false;
  return a.serialNumber === null || b.serialNumber === null || a.serialNumber === b.serialNumber;
}
