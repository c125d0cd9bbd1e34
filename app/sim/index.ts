/** The virtual board and its logger (see virtualBoard.ts, virtualLogger.ts, faults.ts). */
export { createVirtualBoard, synthesiseCapture, type ControlSweep, type VirtualBoard, type VirtualBoardOptions } from './virtualBoard';
export { createVirtualLogger, virtualLoggerLines, type VirtualLogger, type VirtualLoggerOptions } from './virtualLogger';
export { boardFaultNames, faultDescriptions, faultNames, linkFaultNames, parseFaults, type BoardFaultName, type FaultName, type FaultSet, type LinkFaultName } from './faults';
export { fitBoard, type FittedBoard } from './fittedBoard';
