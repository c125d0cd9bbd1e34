/** Capture files in and out: CSV and COMTRADE (IEEE C37.111), streaming, pure. */
export { defaultBlockSamples, type CaptureReader } from './captureReader';
export { createCsvReader, type CsvReaderOptions } from './csvReader';
export { createCsvWriter, formatCsv, type CsvWriter, type CsvWriterOptions } from './csvWriter';
export * from './comtradeConfig';
export { parseComtradeConfig } from './comtradeConfigParse';
export { formatComtradeConfig, formatComtradeDateTime } from './comtradeConfigFormat';
export { analogScaling, mapComtradeChannels, type ComtradeChannelSource, type ComtradeChannelSources } from './comtradeChannelMap';
export { createComtradeDataReader, type ComtradeDataReaderOptions } from './comtradeDataReader';
export { createComtradeCffReader } from './comtradeCffReader';
export { createComtradeDataEncoder, type ComtradeDataEncoder, type ComtradeEncoderOptions } from './comtradeDataEncoder';
export {
  chooseComtradeScaling,
  comtradeCodeLimits,
  comtradeTimeOriginS,
  ComtradeStatsCollector,
  planComtradeConfig,
  type ComtradeCaptureStats,
  type ComtradePlanOptions,
  type ComtradeScaling,
} from './comtradeWritePlan';
