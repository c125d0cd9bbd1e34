/**
 * The calls that need no link: board designs, units, the logbook's sessions, comparisons, drift and exports.
 * Part of the session service (sessionService.ts spreads them into its handlers).
 */
import type { SharePusher } from '../share/sharePusher';
import type { Logbook } from '../store/logbookTypes';
import type { DesignCatalog } from './designCatalog';
import { exportSessionWith, type SessionExporter } from './exporters';
import type { BenchHandlers } from './handlers';
import { compareView, driftView, sessionDetailView, sessionRowView } from './logbookViews';
import { driftWarnings } from './driftWarnings';
import { fleetView } from './fleetView';

type RecallCall = 'listDesigns' | 'getDesign' | 'saveDesign' | 'validateDesign' | 'listUnits' | 'listSessions' | 'sessionDetail' | 'compareSessions' | 'drift' | 'fleet' | 'sharing' | 'exportFormats' | 'exportSession';

export function createRecallHandlers(options: { logbook: Logbook; designs: DesignCatalog; exporters: readonly SessionExporter[]; sharing?: SharePusher | null }): Pick<BenchHandlers, RecallCall> {
  const { logbook, designs, exporters } = options;
  const sharing = options.sharing ?? null;
  return {
    listDesigns: async () => ({ designs: await designs.list() }),
    getDesign: async ({ name, version }) => designs.get(name, version),
    saveDesign: async ({ design }) => designs.save(design),
    validateDesign: async ({ design }) => designs.validate(design),
    async listUnits({ designName }) {
      const units = await logbook.listUnits();
      return { units: units.filter((unit) => designName === undefined || unit.designName === designName) };
    },
    listSessions: async ({ unitSerial, designName, from, to, limit }) => ({ sessions: (await logbook.listSessions({ unitSerial, designName, from, to })).slice(0, limit).map(sessionRowView) }),
    sessionDetail: async ({ sessionId }) => sessionDetailView(logbook, designs, sessionId),
    compareSessions: async ({ sessionIdA, sessionIdB }) => compareView(logbook, sessionIdA, sessionIdB),
    drift: async ({ unitSerial }) => ({ ...(await driftView(logbook, unitSerial)), warnings: await driftWarnings({ logbook, designs }, unitSerial) }),
    fleet: async ({ designName, unitSerial }) => fleetView({ logbook, designs }, designName, unitSerial),
    sharing: async () => (sharing ? sharing.status() : { target: null, waiting: 0, lastAttemptAt: null, lastReachedAt: null, problem: null }),
    exportFormats: async () => ({ formats: exporters.map((exporter) => exporter.format) }),
    exportSession: async ({ sessionId, format }) => exportSessionWith(exporters, { logbook, designs }, sessionId, format),
  };
}
