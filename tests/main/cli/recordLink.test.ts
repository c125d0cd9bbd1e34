/**
 * The link as `rampwright record` reports it, on a real pseudo-terminal pair (socat): the probe's three findings.
 * A logger already streaming when the recorder opens (a cut first line, data before its greeting) is joined with
 * no link error; a logger silent for seconds has its silence measured and shown (progress, summary, logbook,
 * record), its watchdog timeouts not counted as errors; and the progress line and the summary give one count.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { linkErrorCount } from '../../../app/logger';
import { formatProgress, recordSession, type RecordProgress } from '../../../main/cli/commands/record';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { designPath, paceVirtualLogger, ptyPairEachTest } from './recordKit';
import { runCli } from './cliRun';

const rig = ptyPairEachTest('rampwright-link-');

describe('record: the link as reported', () => {
  // Retried: on a machine loaded to the full (the whole suite on two cores) the pty pair's relay has been seen to
  // stall for seconds, so the greeting the recorder asks for arrives after the session's end; what is checked holds
  // on every run that hears the logger at all.
  it('joins a logger that is already streaming with no link error, and records its cycles', { retry: 2, timeout: 30_000 }, async () => {
    // The logger has streamed for 0.6 s when the recorder opens the port (mid-line: the host's first bytes cue the
    // cut line, see recordKit), and answers its start command 150 ms later, data flowing meanwhile.
    const paced = paceVirtualLogger(rig.logger, { seed: 5, autostart: true, joinedAfterS: 0.6, commandLatencyMs: 150 });
    const progress: RecordProgress[] = [];
    const result = await recordSession({ port: rig.pair.hostPath, db: join(rig.folder, 'logbook.sqlite'), unit: 'RW-0517', designPath, seconds: 3, progressIntervalMs: 200, onProgress: (entry) => progress.push(entry) });
    await paced.stop();
    expect(result.session.cycles).toBeGreaterThan(20);
    expect(result.session.linkErrors).toBe(0);
    expect(progress.every((entry) => entry.linkErrors === 0)).toBe(true);
    expect(result.session.linkSilentS).toBe(0);
    const logbook = await openSqliteLogbook(join(rig.folder, 'logbook.sqlite'));
    const kinds = (await logbook.session(result.session.id))!.linkEvents.map((event) => event.kind);
    await logbook.close();
    // What joining looked like is kept, as events that are not errors.
    expect(kinds).toContain('partial-line-at-open');
    expect(kinds).toContain('waiting-for-greeting');
    expect(kinds).not.toContain('garbage');
    expect(kinds).not.toContain('decoder-problem');
  });

  it('measures a silence of seconds and shows it on the progress line, the summary, the logbook and the record', async () => {
    // Silent from 1.5 s to 5.5 s of an 8 s session: the 3 s watchdog gives the port up and reopens it meanwhile.
    const paced = paceVirtualLogger(rig.logger, { seed: 7, autostart: false, silentBetweenS: [1.5, 5.5] });
    const dbPath = join(rig.folder, 'logbook.sqlite');
    const progress: RecordProgress[] = [];
    const result = await recordSession({ port: rig.pair.hostPath, db: dbPath, unit: 'RW-0518', designPath, seconds: 8, onProgress: (entry) => progress.push(entry), progressIntervalMs: 250 });
    await paced.stop();
    const row = result.session;
    // About 4 s of silence (the last line before it and the first after it are up to a pacing step away).
    expect(row.linkSilentS).toBeGreaterThan(3.5);
    expect(row.linkSilentS).toBeLessThan(4.8);
    expect(result.silentStretches).toBe(1);
    // While it lasted, the progress line said so.
    const during = progress.filter((entry) => entry.silentNowS > 0);
    expect(during.length).toBeGreaterThan(3);
    expect(formatProgress(during[during.length - 1])).toMatch(/link SILENT for \d s, waiting for the logger/);
    // The lines lost in the silence are one sequence gap, the only link error; the watchdog is not counted.
    expect(result.decoder.sequenceGaps).toBe(1);
    expect(row.linkErrors).toBe(1);
    const report = await runCli(['report', '--db', dbPath, '--session', String(row.id), '--out', join(rig.folder, 'record.html')]);
    expect(report.code, report.stderr).toBe(0);
    const html = readFileSync(join(rig.folder, 'record.html'), 'utf8');
    expect(html).toMatch(/The logger sent nothing for \d\.\d s in 1 stretch: no reading covers that time\./);
    const log = await runCli(['log', '--db', dbPath]);
    expect(log.stdout).toMatch(/RW-0518 .*\s1\s+\d\.\d$/m);
  }, 40_000);

  it('gives one error count: the last progress line, the summary and the logbook agree', async () => {
    const paced = paceVirtualLogger(rig.logger, { seed: 11, autostart: false, faults: ['corrupt-blocks', 'garbage'] });
    const progress: RecordProgress[] = [];
    const result = await recordSession({ port: rig.pair.hostPath, db: join(rig.folder, 'logbook.sqlite'), unit: 'RW-0519', designPath, seconds: 3, onProgress: (entry) => progress.push(entry), progressIntervalMs: 200 });
    await paced.stop();
    expect(result.session.linkErrors).toBeGreaterThan(0);
    expect(progress[progress.length - 1].linkErrors).toBe(result.session.linkErrors);
    // And the decoder's own one-number count (CRC failures, garbage lines, the sequence gaps the dropped lines leave).
    expect(result.decoder.crcFailures).toBeGreaterThan(0);
    expect(result.decoder.garbageLines).toBeGreaterThan(0);
    expect(result.session.linkErrors).toBe(linkErrorCount(result.decoder));
  }, 30_000);
});
