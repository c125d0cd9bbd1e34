// Recall of a session's steps: as recorded when the logbook has them, recomputed from the stored readings for a
// session recorded before steps were kept (or whose stored steps do not fit the contract).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BenchClient } from '../../../app/contract';
import type { BenchContext } from '../../../main/session/benchContext';
import { openRecordSources } from '../../../main/record/openRecordSources';
import { openLogbookDatabase } from '../../../main/store/openDatabase';
import { recordSweepSession } from '../record/recordFixture';
import { tempFolder, type TempFolder } from '../store/storeFixtures';
import { openTestBench } from './benchClientKit';

let folder: TempFolder;
let context: BenchContext;
let client: BenchClient;
const ids: number[] = [];

beforeAll(async () => {
  folder = tempFolder('rampwright-views-');
  const sources = await openRecordSources(folder.file('logbook.sqlite'), { create: true });
  // RV-1 signed off: its recorded steps end with the sign-off step.
  for (const serial of ['RV-1', 'RV-2', 'RV-3']) ids.push((await recordSweepSession(sources.logbook, { unitSerial: serial, seconds: 0.6, signOff: serial === 'RV-1' ? { kind: 'signed-off' } : undefined })).sessionId);
  await sources.close();
  // RV-2 as an older logbook holds it (no steps kept); RV-3 with steps a foreign tool mangled.
  const db = openLogbookDatabase(folder.file('logbook.sqlite'));
  db.prepare('UPDATE sessions SET steps_json = NULL WHERE id = ?').run(ids[1]);
  db.prepare('UPDATE sessions SET steps_json = ? WHERE id = ?').run('{"not":"steps"', ids[2]);
  db.close();
  ({ context, client } = await openTestBench(folder.file('logbook.sqlite')));
}, 60_000);

afterAll(async () => {
  await context.close();
  folder.remove();
});

describe('session detail steps', () => {
  it('shows the steps as recorded', async () => {
    const detail = await client.sessionDetail({ sessionId: ids[0] });
    expect(detail.steps.map((step) => [step.step, step.status])).toEqual([['sync', 'done'], ['ramp', 'done'], ['trim', 'done'], ['transfer', 'done'], ['limits', 'done'], ['sign-off', 'done']]);
    // Exactly what was stored, not recomputed: a stored reading changed by hand shows as changed.
    const db = openLogbookDatabase(folder.file('logbook.sqlite'));
    const stored = JSON.parse((db.prepare('SELECT steps_json AS json FROM sessions WHERE id = ?').get(ids[0]) as { json: string }).json);
    stored[0].note = 'recorded at the bench';
    db.prepare('UPDATE sessions SET steps_json = ? WHERE id = ?').run(JSON.stringify(stored), ids[0]);
    db.close();
    expect((await client.sessionDetail({ sessionId: ids[0] })).steps[0].note).toBe('recorded at the bench');
  });

  it('recomputes them from the stored readings when none were kept, or when what was kept does not parse', async () => {
    for (const id of [ids[1], ids[2]]) {
      const detail = await client.sessionDetail({ sessionId: id });
      expect(detail.steps.map((step) => step.step)).toEqual(['sync', 'ramp', 'trim', 'transfer', 'limits', 'sign-off']);
      const ramp = detail.steps.find((step) => step.step === 'ramp');
      expect(ramp?.status).toBe('done');
      expect(ramp?.readings.find((reading) => reading.key === 'rampPeakV')?.value).toBeGreaterThan(1);
    }
  });
});
