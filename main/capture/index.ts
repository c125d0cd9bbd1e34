/** Capture files on disk: streaming read and write of CSV and COMTRADE captures (pure formats in app/formats). */
export { readCaptureFile, readComtradeConfigFile, type ReadCaptureOptions } from './readCaptureFile';
export { writeCaptureFile, type CaptureWriteFormat, type WriteCaptureOptions, type WrittenCapture } from './writeCaptureFile';
export { captureSummary, type CaptureSummary } from './captureSummary';
export { captureKindOf, comtradePartner } from './captureFiles';
