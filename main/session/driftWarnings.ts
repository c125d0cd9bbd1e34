/**
 * The drift forecast for the Logbook screen: for each trended figure of a unit (ramp peak, slope, alpha gain and
 * offset, jitter) the least-squares trend across its sessions and whether it will cross the design's tolerance
 * (main/record/recall.ts driftReport). Reads beside the session writer through its own connection (WAL).
 */
import { driftReport } from '../record/recall';
import type { ExportContext } from './exporters';
import { withSources } from './recordExporters';

export async function driftWarnings(context: ExportContext, unitSerial: string): Promise<string[]> {
  const sessions = await context.logbook.listSessions({ unitSerial });
  if (sessions.length === 0) return [];
  return withSources(context, async (sources) => (await driftReport(sources, unitSerial)).warnings);
}
