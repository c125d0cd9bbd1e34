/**
 * Timed edges are sent only to a host that asks (PROTOCOL.md "Timed edges"), so a host that does not know edge
 * lines never sees one. A host that does asks after every greeting that announces them: after `start`, `rate`,
 * `identify` and a logger restart alike (the request is idempotent, and a restarted logger has forgotten it).
 */
import { encodeCommand } from './encode';
import { unframeLine, withoutCarriageReturn } from './frame';
import { parseGreetingBody } from './greeting';

/** The command line to send in answer to this logger line (`edges on` after a greeting with `edges=`), or null. */
export function edgeRequestAfter(rawLine: string): string | null {
  if (!rawLine.startsWith('H ')) return null;
  const line = withoutCarriageReturn(rawLine);
  const frame = unframeLine(line);
  if (!frame.ok) return null;
  const parsed = parseGreetingBody(line.slice(0, frame.bodyEnd));
  return parsed.ok && parsed.greeting.edgeTiming ? encodeCommand({ command: 'edges', on: true }) : null;
}
