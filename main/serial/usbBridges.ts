/**
 * USB-serial bridges a Rampwright logger is commonly built on, known by their USB vendor and product ids, so the
 * host can offer the logger's port first. The ids are facts of the trade: assigned by the USB-IF, built into the
 * bridge chips and listed by every operating system's serial drivers (from memory; the ids are what matters, and a
 * logger on another bridge still works, it is only not offered first).
 */
export interface UsbBridge {
  vendorId: string;
  /** Null: every product of this vendor (makers of boards whose bridge is a USB microcontroller of their own). */
  productId: string | null;
  /** What the bridge is, in words for the port list. */
  description: string;
}

export const loggerBridges: readonly UsbBridge[] = [
  { vendorId: '2341', productId: null, description: '8-bit board USB bridge' },
  { vendorId: '2a03', productId: null, description: '8-bit board USB bridge' },
  { vendorId: '1a86', productId: '7523', description: 'USB-serial bridge' },
  { vendorId: '1a86', productId: '55d4', description: 'USB-serial bridge' },
  { vendorId: '10c4', productId: 'ea60', description: 'USB-serial bridge' },
  { vendorId: '0403', productId: '6001', description: 'USB-serial bridge' },
  { vendorId: '0403', productId: '6015', description: 'USB-serial bridge' },
  { vendorId: '067b', productId: '2303', description: 'USB-serial bridge' },
];

/** The bridge a port's USB ids (lower-case hex, as listPorts gives them) belong to, or null. */
export function loggerBridgeOf(port: { vendorId: string | null; productId: string | null }): UsbBridge | null {
  if (port.vendorId === null) return null;
  return loggerBridges.find((bridge) => bridge.vendorId === port.vendorId && (bridge.productId === null || bridge.productId === port.productId)) ?? null;
}
