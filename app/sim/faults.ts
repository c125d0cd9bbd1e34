/**
 * Named faults of the virtual board (our own names). Board faults change what the board does; link faults change
 * what reaches the host. Each has one line saying what a technician at the bench would see.
 */
import { InputError } from '../errors';

export const boardFaultNames = [
  'wrong-emitter-resistor',
  'capacitor-low',
  'sync-phase-shift',
  'missing-pulses',
  'wrong-half-cycle-pulses',
  'noisy-sync',
  'clipped-ramp',
  'sync-offset',
  'stacked-tolerances',
] as const;

export const linkFaultNames = ['drop-blocks', 'corrupt-blocks', 'garbage', 'logger-overrun', 'unplug-after'] as const;

export type BoardFaultName = (typeof boardFaultNames)[number];
export type LinkFaultName = (typeof linkFaultNames)[number];
export type FaultName = BoardFaultName | LinkFaultName;

export const faultDescriptions: Record<FaultName, string> = {
  'wrong-emitter-resistor': 'emitter resistor 1.5 times the design value fitted: the ramp is short (about two thirds of its height) and fires late for a given control voltage',
  'capacitor-low': 'ramp capacitor 30 % below its value: the ramp is steep and tall, fires early, and may clip at the current source limit',
  'sync-phase-shift': 'sync filter lags 20 degrees more than designed: the ramp starts late after the sync zero crossing and every firing angle reads 20 degrees high',
  'missing-pulses': 'the pulse stage skips about one firing in five: missing pulses, an uneven output',
  'wrong-half-cycle-pulses': 'half-wave board whose ramp is not held in reset in the negative half-cycle: a second pulse fires there, 180 degrees after the right one',
  'noisy-sync': 'noise on the sync input: a ragged sync trace and a ramp reset that wanders, so the firing angle jitters by a couple of degrees',
  'clipped-ramp': 'current source overdriven for its supply headroom: the ramp flattens at the compliance limit before the half-cycle ends, and the control range above it is dead',
  'sync-offset': 'a DC offset of 3 % of the sync peak (a leaky coupling capacitor, an unbalanced winding): the board resets its ramp early in one half-cycle and late in the other, so the two halves of a full-wave board fire about 3.4 degrees apart and their ramps differ in height',
  'stacked-tolerances': 'the parts of the current source inside their tolerance but on the side that lowers the ramp (lower bias resistor and ramp capacitor high): the ramp is about an eighth short, a case for a bias trim, not a new part',
  'drop-blocks': 'about 2 % of data lines never reach the host: link health shows sequence gaps and lost samples',
  'corrupt-blocks': 'about 2 % of data lines arrive with a changed character: link health shows CRC failures',
  garbage: 'bursts of noise characters between lines and glued before some lines: link health shows skipped noise',
  'logger-overrun': 'the logger falls behind and discards about 1 % of its blocks, reporting them in its status lines',
  'unplug-after': 'the logger goes silent after the given seconds, as if its USB cable were pulled (unplug-after=SECONDS)',
};

export const faultNames: readonly FaultName[] = [...boardFaultNames, ...linkFaultNames];

export interface FaultSet {
  board: BoardFaultName[];
  link: LinkFaultName[];
  /** Seconds of signal before the logger goes silent (unplug-after). */
  unplugAfterS: number | null;
}

export function isBoardFault(name: FaultName): name is BoardFaultName {
  return (boardFaultNames as readonly string[]).includes(name);
}

/** Reads fault words as typed on the command line (`noisy-sync`, `unplug-after=2.5`). */
export function parseFaults(words: readonly string[], where = '--fault'): FaultSet {
  const set: FaultSet = { board: [], link: [], unplugAfterS: null };
  for (const word of words) {
    const [name, value] = word.split(/[=:]/, 2);
    if (!(faultNames as readonly string[]).includes(name)) {
      throw new InputError(`unknown fault "${word}"; known faults: ${faultNames.join(', ')}`, where);
    }
    const fault = name as FaultName;
    if (fault === 'unplug-after') {
      const seconds = Number(value);
      if (value === undefined || !Number.isFinite(seconds) || seconds <= 0) {
        throw new InputError(`unplug-after needs the seconds before the cable is pulled, e.g. unplug-after=3 (got "${word}")`, where);
      }
      set.unplugAfterS = seconds;
    } else if (value !== undefined) {
      throw new InputError(`fault "${name}" takes no value (got "${word}")`, where);
    }
    if (isBoardFault(fault)) {
      if (!set.board.includes(fault)) set.board.push(fault);
    } else if (!set.link.includes(fault)) {
      set.link.push(fault);
    }
  }
  return set;
}
