/** Accuracy against ngspice: the 60 Hz half-wave board and the clipping board (ngspiceAccuracyCases.ts). */
import { deckCases, describeAccuracySuite } from './ngspiceAccuracyCases';

describeAccuracySuite('analysis against ngspice: half-wave and clipping boards', deckCases.filter((deckCase) => deckCase.design.rectifier === 'half-wave' || deckCase.expectClipped));
