/** The serial link to the data logger. */
export { openLoggerLink, type LinkEvent, type LinkItem, type LinkLine, type LinkStats, type LoggerLink, type LoggerLinkOptions } from './loggerLink';
export { listPorts, portInfoFrom, sameUsbDevice, type PortInfo } from './listPorts';
export { LinkError, checkDevicePath, linkErrorFromMessage, type LinkErrorKind } from './linkErrors';
export { createBoundedLineSplitter, type BoundedLineSplitter } from './boundedLineSplitter';
