/**
 * A disk that fills while `rampwright record` writes: a real ENOSPC, from a small tmpfs mounted in a private mount
 * namespace (unshare; as root in CI, in a user namespace otherwise), so nothing outside the test sees it. The probe
 * saw the progress line count 546 cycles while 177 were stored, a stack trace, exit 1, the session left open, and
 * `log` crash until space was freed. Here: the fault is said at once in words (disk full, which file), the
 * recording stops, what was stored is kept, the session is marked interrupted with a note, exit 2; and with the
 * disk still full, log, report and export read the logbook while import is refused in words.
 */
import { spawn } from 'node:child_process';
import { copyFileSync, mkdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { SerialPort } from 'serialport';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openSqliteLogbook } from '../../../main/store/sqliteLogbook';
import { runsAsRoot } from '../../helpers/otherUser';
import { startPtyPair, type PtyPair } from '../../helpers/socat';
import { closePort, openLoggerEnd } from '../serial/linkTestKit';
import { chargerDesign, cycleReading, tempFolder, type TempFolder } from '../store/storeFixtures';
import { designPath, paceVirtualLogger } from './recordKit';

let folder: TempFolder;
let pair: PtyPair;
let logger: SerialPort;

beforeAll(async () => {
  folder = tempFolder('rampwright-diskfull-');
  pair = await startPtyPair(folder.file('host'), folder.file('logger'));
  logger = await openLoggerEnd(pair.loggerPath);
});
afterAll(async () => {
  await closePort(logger);
  await pair.stop();
  folder.remove();
});

/** The commands run inside the namespace, each writing `<name>.out`, `<name>.err` and `<name>.code` to `results`. */
const script = String.raw`
set -u
mkdir -p "$FULL"
mount -t tmpfs -o size=1m tmpfs "$FULL" || { echo "cannot mount a tmpfs" > "$RESULTS/mount.err"; exit 90; }
cp "$SEED" "$FULL/logbook.sqlite"
# Leave the recorder the 512 KiB it keeps in reserve and about 200 KiB more to fill.
used=$(du -k "$FULL" | tail -1 | cut -f1)
head -c $(( (1024 - used - 512 - 200) * 1024 )) /dev/zero > "$FULL/filler"
run() { name=$1; shift; "$NODE" --import tsx main/cli/rampwright.ts "$@" > "$RESULTS/$name.out" 2> "$RESULTS/$name.err"; echo $? > "$RESULTS/$name.code"; }
run record record --port "$PORT" --db "$FULL/logbook.sqlite" --unit RW-0911 --design "$DESIGN" --seconds 60
# The disk stays full for the readers: take whatever the recorder gave back.
cat /dev/zero > "$FULL/filler-2" 2> /dev/null
df -k "$FULL" | tail -1 > "$RESULTS/df.txt"
run log log --db "$FULL/logbook.sqlite" --json
run report report --db "$FULL/logbook.sqlite" --session 2 --out "$RESULTS/record.html"
run export export --db "$FULL/logbook.sqlite" --session 2 --out "$RESULTS/session.rwsession"
run import import --db "$FULL/logbook.sqlite" "$ARCHIVE"
ls "$FULL" > "$RESULTS/files.txt"
cp "$FULL"/logbook.sqlite* "$RESULTS/"
`;

function runInPrivateMount(env: Record<string, string>): Promise<number | null> {
  const unshare = runsAsRoot ? ['unshare', '--mount', '--propagation', 'private'] : ['unshare', '--user', '--map-root-user', '--mount', '--propagation', 'private'];
  const child = spawn(unshare[0], [...unshare.slice(1), 'bash', '-c', script], { cwd: process.cwd(), stdio: 'ignore', env: { ...process.env, ...env, NODE: process.execPath } });
  return new Promise((resolve) => child.on('exit', (code) => resolve(code)));
}

const result = (name: string, part: 'out' | 'err' | 'code'): string => readFileSync(folder.file(join('results', `${name}.${part}`)), 'utf8');
const files = (): string => readFileSync(folder.file('results/files.txt'), 'utf8');

describe('a disk that fills during record', () => {
  it('stops, says so in words, keeps what is stored, marks the session; readers still work on the full disk', async () => {
    // A logbook with one earlier session, and an archive of another bench's session to try importing.
    const seed = folder.file('seed.sqlite');
    const logbook = await openSqliteLogbook(seed);
    const earlier = await logbook.startSession({ unitSerial: 'RW-0910', design: chargerDesign(), operator: 'bench 3' });
    earlier.addCycle(cycleReading(0, { alphaDeg: 88 }));
    await earlier.close();
    await logbook.close();
    const other = folder.file('other.sqlite');
    const otherBook = await openSqliteLogbook(other);
    const otherSession = await otherBook.startSession({ unitSerial: 'RW-0999', design: chargerDesign(), operator: 'bench 9' });
    for (let index = 0; index < 2000; index += 1) otherSession.addCycle(cycleReading(index * 0.02));
    await otherSession.close();
    await otherBook.close();
    const { runCli } = await import('./cliRun');
    expect((await runCli(['export', '--db', other, '--session', '1', '--out', folder.file('other.rwsession')])).code).toBe(0);

    mkdirSync(folder.file('results'));
    const paced = paceVirtualLogger(logger, { seed: 13, autostart: false });
    const code = await runInPrivateMount({ FULL: folder.file('full'), SEED: seed, RESULTS: folder.file('results'), PORT: pair.hostPath, DESIGN: designPath, ARCHIVE: folder.file('other.rwsession') });
    await paced.stop();
    expect(code).toBe(0);
    const full = folder.file('full/logbook.sqlite');

    // record: exit 2, the fault in words with the file, what was kept; no stack trace, no closing summary.
    expect(result('record', 'code').trim()).toBe('2');
    const recordErr = result('record', 'err');
    expect(recordErr).toContain(`rampwright: ${full}: cannot be written: the disk is full (writing ${full} and its write-ahead log ${full}-wal): recording stops now; what is stored is kept`);
    expect(recordErr).toMatch(/Recording stopped after \d+\.\d s; session 2 keeps the (\d+) cycles stored before, marked interrupted with a note of why/);
    expect(recordErr).not.toMatch(/\n\s+at |internal error/);
    expect(result('record', 'out')).toBe('');
    const keptCycles = Number(/keeps the (\d+) cycles/.exec(recordErr)?.[1]);
    expect(keptCycles).toBeGreaterThan(0);
    // Progress lines (one every 5 s off a terminal) never claimed more cycles than were stored.
    for (const match of recordErr.matchAll(/cycles (\d+) {2}alpha/g)) expect(Number(match[1])).toBeLessThanOrEqual(keptCycles);

    // The disk was still full for the readers.
    expect(Number(readFileSync(folder.file('results/df.txt'), 'utf8').trim().split(/\s+/)[3])).toBeLessThan(8);
    expect(result('log', 'code').trim()).toBe('0');
    const sessions = (JSON.parse(result('log', 'out')) as { sessions: Array<{ id: number; unit: string; status: string; cycles: number }> }).sessions;
    expect(sessions).toMatchObject([
      { id: 1, unit: 'RW-0910', status: 'closed', cycles: 1 },
      { id: 2, unit: 'RW-0911', status: 'interrupted', cycles: keptCycles },
    ]);
    expect(result('report', 'code').trim()).toBe('0');
    expect(readFileSync(folder.file('results/record.html'), 'utf8')).toMatch(/Recording stopped at [\dT:.-]+Z: .*the disk is full/);
    expect(result('export', 'code').trim()).toBe('0');
    expect(statSync(folder.file('results/session.rwsession')).size).toBeGreaterThan(100);
    // A writer on the full disk is refused in words.
    expect(result('import', 'code').trim()).toBe('2');
    expect(result('import', 'err')).toMatch(/the disk is full/);
    expect(result('import', 'err')).not.toMatch(/\n\s+at |internal error/);
    // The reserve was given back.
    expect(files()).not.toMatch(/reserve/);

    // The logbook as it was left: consistent, both sessions there.
    for (const name of ['logbook.sqlite', 'logbook.sqlite-wal', 'logbook.sqlite-shm']) {
      try {
        copyFileSync(folder.file(`results/${name}`), folder.file(`copy-${name}`));
      } catch {
        // -wal and -shm may be gone after a clean close.
      }
    }
    const copy = await openSqliteLogbook(folder.file('copy-logbook.sqlite'));
    const rows = await copy.listSessions();
    await copy.close();
    expect(rows.map((row) => [row.unit, row.status, row.cycles])).toEqual([
      ['RW-0910', 'closed', 1],
      ['RW-0911', 'interrupted', keptCycles],
    ]);
  }, 180_000);
});
