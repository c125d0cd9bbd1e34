/**
 * The drift forecast for the Logbook screen: for each trended figure of a unit (ramp peak, slope, alpha gain and
 * offset, jitter) the least-squares trend across its sessions and whether it will cross the design's tolerance
 * (main/record/recall.ts driftReport).
 */
import { driftReport } from '../record/recall';
import type { ExportContext } from './exporters';

export async function driftWarnings(context: ExportContext, unitSerial: string): Promise<string[]> {
  const sessions = await context.logbook.listSessions({ unitSerial });
  if (sessions.length === 0) return [];
  return (await driftReport(context, unitSerial)).warnings;
}
