/**
 * What a commissioning record says first: how the session ended, in words a reviewer cannot miss. A unit signed off
 * with exceptions says so in capitals, with the technician's written reason and every step excepted; a session
 * closed without sign-off says the record certifies nothing. The HTML page and the PDF both print this.
 */
import { signOffExceptionText } from '../bench/signOffGate';
import { outcomeWords, type SessionOutcome, type SignOffException } from '../contract/records';

export interface OutcomeStatement {
  /** One line in capitals for a sign-off with exceptions, else in sentence case. */
  heading: string;
  lines: string[];
  /** 'accepted' (signed off), 'excepted' (signed off with exceptions), 'not-certified' (anything else). */
  tone: 'accepted' | 'excepted' | 'not-certified';
  /** The reason as written, quoted in the record; null unless signed off with exceptions. */
  reason: string | null;
  exceptions: string[];
}

export function outcomeStatement(session: { outcome: SessionOutcome; operator: string; signOffReason: string | null; signOffExceptions: readonly SignOffException[] }): OutcomeStatement {
  const words = outcomeWords[session.outcome];
  switch (session.outcome) {
    case 'signed-off':
      return { heading: words.text, lines: ['Every commissioning step was recorded, and each was within its tolerance when it was recorded.'], tone: 'accepted', reason: null, exceptions: [] };
    case 'signed-off-with-exceptions':
      return {
        heading: words.text.toUpperCase(),
        lines: [
          `This unit was signed off although the steps below were missing, not measured or out of tolerance. ${session.operator} signed it off with the reason quoted here.`,
          'Read the exceptions before accepting the unit: the record does not show that it meets every check of its design.',
        ],
        tone: 'excepted',
        reason: session.signOffReason ?? '(no reason was kept)',
        exceptions: session.signOffExceptions.map(signOffExceptionText),
      };
    case 'closed':
      return { heading: words.text, lines: ['The session was closed without a sign-off: this record states measurements only and does not certify the unit.'], tone: 'not-certified', reason: null, exceptions: [] };
    case 'interrupted':
      return { heading: words.text, lines: ['The recording stopped before the session was closed (power, crash or a lost link): there was no sign-off, and this record does not certify the unit.'], tone: 'not-certified', reason: null, exceptions: [] };
    case 'open':
      return { heading: 'Still open', lines: ['The session is still being recorded: there is no sign-off yet.'], tone: 'not-certified', reason: null, exceptions: [] };
  }
}
