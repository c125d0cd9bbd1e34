/** The logger protocol: decoder, encoders, CRC (see PROTOCOL.md). */
export { createLoggerDecoder, type DecodedEvent, type LoggerDecoder, type LoggerDecoderOptions } from './decoder';
export { encodeBlock, encodeCommand, encodeEdges, encodeGreeting, encodeReply, encodeStatus, parseCommand, parseEdgesBody, type CommandParse } from './encode';
export { edgeRequestAfter } from './edgeRequest';
export { crc32, crc32OfText, crcToHex } from './crc32';
export { frameLine, unframeLine } from './frame';
export { parseGreetingBody } from './greeting';
export { emptyLinkHealth, linkErrorCount, type LinkHealth, type LinkProblem, type LinkProblemCode } from './health';
export * from './protocol';
