/** The analysis engine's public face: the capture analyzer, its readings and the checks against a design. */
export { createCaptureAnalyzer, type CaptureAnalyzer, type CaptureAnalyzerOptions } from './captureAnalyzer';
export { judgeReadings, marginalFraction, verdictFor, type ReadingCheck } from './judge';
export type { CaptureReadings, CycleReading, PulseSummary, RampSummary, Rectifier, TransferSummary } from './readings';
