/**
 * The bench API contract: every call and event between the screens and the session service, with zod schemas.
 * The renderer imports this (types and the client builders); main implements it once and carries it over
 * Electron IPC and the loopback HTTP/WebSocket server.
 */
export * from './errors';
export * from './readings';
export * from './verdicts';
export * from './records';
export * from './calls';
export * from './bench-events';
export * from './client';
export * from './http-transport';
export * from './validate';
export * from './names';
export * from './captureImport';
