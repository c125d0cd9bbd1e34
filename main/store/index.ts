/** The logbook: the `Logbook` interface and its SQLite implementation. */
export * from './logbookTypes';
export { openSqliteLogbook, createSqliteLogbook } from './sqliteLogbook';
export { canonicalJson, archiveContentHash } from './canonicalJson';
export { openLogbook, resolveLogbookLocation, type OpenLogbookOptions } from './openLogbook';
export { openLogbookDatabase, type OpenLogbookDatabaseOptions } from './openDatabase';
export { latestSchemaVersion } from './schema';
export { driftTrend } from './driftTrend';
export { decodeCapture, encodeCapture, rawCaptureBytes, sha256Hex } from './captureCodec';
export { isPostgresLocation, logbookDisplayLocation } from './postgres/connection';
export { SharedLogbookUnreachable, connectionFaultDetail, isConnectionFault } from './postgres/pgErrors';
export { benchName } from './benchName';
