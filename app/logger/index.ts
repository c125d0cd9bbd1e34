/** The logger protocol: decoder, encoders, CRC (see PROTOCOL.md). */
export { createLoggerDecoder, type DecodedEvent, type LoggerDecoder, type LoggerDecoderOptions } from './decoder';
export { encodeBlock, encodeCommand, encodeGreeting, encodeReply, encodeStatus, parseCommand, type CommandParse } from './encode';
export { crc32, crc32OfText, crcToHex } from './crc32';
export { frameLine, unframeLine } from './frame';
export { parseGreetingBody } from './greeting';
export { emptyLinkHealth, linkErrorCount, type LinkHealth, type LinkProblem, type LinkProblemCode } from './health';
export * from './protocol';
