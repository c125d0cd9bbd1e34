/** Accuracy against ngspice, full-wave boards at 50 Hz: fixed and swept control (ngspiceAccuracyCases.ts). */
import { deckCases, describeAccuracySuite } from './ngspiceAccuracyCases';

describeAccuracySuite('analysis against ngspice: full-wave boards', deckCases.filter((deckCase) => deckCase.design.rectifier === 'full-wave' && !deckCase.expectClipped));
