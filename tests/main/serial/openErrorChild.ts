/** Opens a serial device and prints how it went as JSON; run by linkErrors.test.ts as an unprivileged user. */
import { openLoggerLink } from '../../../main/serial/loggerLink';

openLoggerLink({ path: process.argv[2] ?? '', noDataTimeoutMs: 0 }).then(
  async (link) => {
    process.stdout.write(JSON.stringify({ opened: true }));
    await link.close();
    process.exit(0);
  },
  (error: Error & { kind?: string }) => {
    process.stdout.write(JSON.stringify({ opened: false, name: error.name, kind: error.kind, message: error.message }));
    process.exit(0);
  },
);
