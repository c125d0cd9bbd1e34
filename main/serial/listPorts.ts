/**
 * The serial ports on this computer, with the USB identity a logger is recognised by when it comes back on another
 * path (SerialPort.list; on Linux it asks udev through `udevadm`).
 */
import { SerialPort } from 'serialport';

export interface PortInfo {
  path: string;
  /** USB vendor and product ids as four hex digits, lower case (null for a port that is not USB). */
  vendorId: string | null;
  productId: string | null;
  serialNumber: string | null;
  manufacturer: string | null;
}

const normalisedId = (value: string | undefined): string | null => (value ? value.toLowerCase().replace(/^0x/, '').padStart(4, '0') : null);

export function portInfoFrom(raw: { path: string; vendorId?: string; productId?: string; serialNumber?: string; manufacturer?: string }): PortInfo {
  return {
    path: raw.path,
    vendorId: normalisedId(raw.vendorId),
    productId: normalisedId(raw.productId),
    serialNumber: raw.serialNumber ?? null,
    manufacturer: raw.manufacturer ?? null,
  };
}

export async function listPorts(): Promise<PortInfo[]> {
  const ports = await SerialPort.list();
  return ports.map(portInfoFrom);
}

/** True when two ports are the same USB device (vendor, product and, when both have one, serial number). */
export function sameUsbDevice(a: PortInfo, b: PortInfo): boolean {
  if (a.vendorId === null || a.productId === null) return false;
  if (a.vendorId !== b.vendorId || a.productId !== b.productId) return false;
  return a.serialNumber === null || b.serialNumber === null || a.serialNumber === b.serialNumber;
}
