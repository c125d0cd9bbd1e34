/**
 * The names of every call and event, without their schemas: small enough for the sandboxed preload, which needs
 * the names only. calls.ts and bench-events.ts are checked against these lists by the compiler (both ways).
 */
export const benchCallNames = [
  'listPorts',
  'connect',
  'disconnect',
  'setVirtualControl',
  'captureUploadStart',
  'captureUploadChunk',
  'inspectCapture',
  'saveCaptureMap',
  'listDesigns',
  'getDesign',
  'saveDesign',
  'validateDesign',
  'listUnits',
  'startSession',
  'stopSession',
  'benchState',
  'setHold',
  'keepCapture',
  'checkStep',
  'signOff',
  'trimPlan',
  'applyTrim',
  'transferPoints',
  'clearTransfer',
  'listSessions',
  'sessionDetail',
  'compareSessions',
  'drift',
  'fleet',
  'sharing',
  'exportFormats',
  'exportSession',
] as const;

export const benchEventNames = ['live', 'health', 'state', 'transfer', 'notice', 'menuCommand', 'captureProgress'] as const;

export type BenchCallName = (typeof benchCallNames)[number];
export type BenchEventName = (typeof benchEventNames)[number];

export function isBenchCallName(name: unknown): name is BenchCallName {
  return typeof name === 'string' && (benchCallNames as readonly string[]).includes(name);
}

export function isBenchEventName(name: unknown): name is BenchEventName {
  return typeof name === 'string' && (benchEventNames as readonly string[]).includes(name);
}

/** True when two unions of names hold the same names (used to tie the lists to the schemas at compile time). */
export type SameNames<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
