/**
 * The decks and logger scenarios of the ngspice accuracy suites (ngspiceAccuracy*.test.ts), and the suite itself:
 * whole firing boards simulated from their designs (tests/reference/firingBoardDeck.ts: sync, reset switch, PNP current
 * source with VAF set, comparator, gate pulse), resampled the way a logger would sample them (asynchronous start,
 * 5-200 kS/s, white noise, 8-16 bit ADC), analysed, and compared with the truth read directly from the dense trace
 * (deckTruth.ts), never from our code.
 * Limits (issue 2): frequency within 0.05 Hz; ramp peak within 1.5 %; mean alpha within half a sample period in
 * degrees (360 f / fs / 2) plus 0.1 deg, the limit a step-like gate edge allows (REFERENCES.md); counts exact;
 * clipping detected.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { createCaptureAnalyzer } from '../../../app/bench/captureAnalyzer';
import type { CaptureReadings } from '../../../app/bench/readings';
import type { BoardDesign } from '../../../app/board/design';
import { controlForAlpha } from '../../../app/board/firingAngle';
import { fitLine } from '../../../app/signal/leastSquares';
import { medianOf } from '../../../app/signal/runningStatistics';
import { referenceBoards } from '../boardCases';
import { type FiringBoardDeckOptions, type FiringBoardTraces, simulateFiringBoard } from '../firingBoardDeck';
import { ngspiceAvailable } from '../ngspice';
import { deckTruth, type DeckTruth, resampleTraces, type Resampling, truthAlphaDeg } from './deckTruth';

export interface DeckCase {
  name: string;
  design: BoardDesign;
  deck: (design: BoardDesign) => FiringBoardDeckOptions;
  expectClipped: boolean;
}

function controlFor(design: BoardDesign, alphaDeg: number): number {
  const controlV = controlForAlpha(design, alphaDeg);
  if (controlV === null) throw new Error(`${design.name}: no control voltage for ${alphaDeg} deg`);
  return controlV;
}

// Boards of our own (tests/reference/boardCases.ts); 10 cycles each keeps the file near 20 s on a loaded 2-core machine.
export const deckCases: DeckCase[] = [
  { name: '50 Hz full-wave, alpha 90', design: referenceBoards.fullWave50, deck: (design) => ({ controlV: controlFor(design, 90), cycles: 10 }), expectClipped: false },
  { name: '60 Hz half-wave, alpha 55', design: referenceBoards.halfWave60, deck: (design) => ({ controlV: controlFor(design, 55), cycles: 10 }), expectClipped: false },
  {
    name: '60 Hz half-wave, sync lagging the mains by 12 deg (corrected from the design), alpha 100',
    design: { ...referenceBoards.halfWave60, syncPhaseDeg: 12 },
    deck: (design) => ({ controlV: controlFor(design, 100), cycles: 10 }),
    expectClipped: false,
  },
  {
    name: '50 Hz full-wave, control swept (transfer curve)',
    design: referenceBoards.fullWave50Drive,
    deck: (design) => ({ controlV: { fromV: controlFor(design, 30), toV: controlFor(design, 150) }, cycles: 10 }),
    expectClipped: false,
  },
  {
    name: '50 Hz full-wave, ramp capacitor 150 nF instead of 470 nF (clips)',
    design: referenceBoards.fullWave50,
    // A third of the capacitance triples the slope: the ramp reaches the source's compliance (about 12.7 V) early.
    deck: () => ({ controlV: 6, cycles: 10, partOverrides: { cRamp: 1.5e-7 } }),
    expectClipped: true,
  },
];

// Logger scenarios: rate, ADC bits, rms noise, sampling phase (our own choices covering 5-200 kS/s and 8-16 bits).
export const resamplings: Resampling[] = [
  { sampleRateHz: 5000, bits: 12, noiseV: 0.003, phase: 0.37, seed: 1 },
  { sampleRateHz: 10000, bits: 8, noiseV: 0.002, phase: 0.81, seed: 2 },
  { sampleRateHz: 25000, bits: 10, noiseV: 0.005, phase: 0.13, seed: 3 },
  { sampleRateHz: 50000, bits: 14, noiseV: 0.002, phase: 0.55, seed: 4 },
  { sampleRateHz: 200000, bits: 16, noiseV: 0.001, phase: 0.29, seed: 5 },
];

function analyze(traces: FiringBoardTraces, design: BoardDesign, resampling: Resampling): CaptureReadings {
  const analyzer = createCaptureAnalyzer({ rectifier: design.rectifier, syncPhaseDeg: design.syncPhaseDeg });
  for (const block of resampleTraces(traces, resampling)) analyzer.push(block);
  return analyzer.finish();
}

const available = ngspiceAvailable();

export function describeAccuracySuite(title: string, cases: readonly DeckCase[]): void {
  describe.skipIf(!available)(title, () => {
    const simulated = new Map<string, { traces: FiringBoardTraces; truth: DeckTruth }>();

    beforeAll(() => {
      for (const deckCase of cases) {
        const traces = simulateFiringBoard(deckCase.design, deckCase.deck(deckCase.design));
        const truth = deckTruth(traces, { rectifier: deckCase.design.rectifier, gateHighV: 5, vecSatV: deckCase.design.transistor.vecSatV, syncPhaseDeg: deckCase.design.syncPhaseDeg });
        simulated.set(deckCase.name, { traces, truth });
      }
    }, 120_000);

    for (const deckCase of cases) {
      describe(deckCase.name, () => {
        it('the deck behaves as the case says (truth read from the trace)', () => {
          const { truth } = simulated.get(deckCase.name) as { truth: DeckTruth };
          expect(truth.windows.length).toBeGreaterThanOrEqual(deckCase.design.rectifier === 'full-wave' ? 17 : 8);
          expect(truth.windows.some((window) => window.clipped)).toBe(deckCase.expectClipped);
          // Each firing interval fires once in its right half-cycle.
          for (const window of truth.windows) expect(window.firingS.length).toBe(1);
        });

        for (const resampling of resamplings) {
          it(`${resampling.sampleRateHz} S/s, ${resampling.bits} bits, ${resampling.noiseV * 1000} mV noise`, () => {
            const { traces, truth } = simulated.get(deckCase.name) as { traces: FiringBoardTraces; truth: DeckTruth };
            const readings = analyze(traces, deckCase.design, resampling);
            const design = deckCase.design;

            expect(Math.abs((readings.frequencyHz ?? 0) - truth.frequencyHz)).toBeLessThan(0.05);

            // Counts exact: firing intervals, cycles, pulses, none missing or in the wrong half.
            expect(readings.firingIntervals).toBe(truth.windows.length);
            expect(readings.cycles).toBe(truth.risingS.length - 1);
            const truthPulses = truth.windows.reduce((sum, window) => sum + window.firingS.length + window.wrongHalfS.length, 0);
            expect(readings.pulse.count).toBe(truthPulses);
            expect(readings.pulse.missing).toBe(truth.windows.filter((window) => window.firingS.length === 0).length);
            expect(readings.pulse.wrongHalfCycle).toBe(truth.windows.reduce((sum, window) => sum + window.wrongHalfS.length, 0));

            // Ramp peak: median of the per-interval peaks within 1.5 %.
            const truthPeakV = medianOf(truth.windows.map((window) => window.peakV)) as number;
            expect(Math.abs((readings.ramp.peakV ?? 0) - truthPeakV) / truthPeakV).toBeLessThan(0.015);
            expect(readings.ramp.clipped).toBe(deckCase.expectClipped);

            // Mean alpha within half a sample period in degrees plus 0.1 deg.
            const truthAlphas = truth.windows.map((window) => truthAlphaDeg(window, design)).filter((alpha): alpha is number => alpha !== null);
            const truthMeanDeg = truthAlphas.reduce((sum, alpha) => sum + alpha, 0) / truthAlphas.length;
            const limitDeg = (360 * truth.frequencyHz) / resampling.sampleRateHz / 2 + 0.1;
            expect(Math.abs((readings.pulse.alphaDeg ?? 0) - truthMeanDeg)).toBeLessThan(limitDeg);
            // Every interval's alpha within half a sample plus the sync timing noise (0.1 deg).
            expect((readings.pulse.alphaMaxDeg ?? 0) - Math.max(...truthAlphas)).toBeLessThan(limitDeg);
            expect(Math.min(...truthAlphas) - (readings.pulse.alphaMinDeg ?? 0)).toBeLessThan(limitDeg);

            if (typeof deckCase.deck(design).controlV !== 'number') {
              // Transfer curve against the least-squares line through the trace's own (control, alpha) points.
              const points = truth.windows.filter((window) => window.controlAtFiringV !== null);
              const truthFit = fitLine(points.map((window) => window.controlAtFiringV as number), points.map((window) => truthAlphaDeg(window, design) as number));
              expect(readings.transfer).not.toBeNull();
              expect(readings.transfer?.points).toBe(points.length);
              // Gain over the swept range (about 120 deg): alpha errors of half a sample move it by well under 1 %.
              expect(Math.abs((readings.transfer?.gainDegPerV ?? 0) - (truthFit?.slope ?? 0)) / Math.abs(truthFit?.slope ?? 1)).toBeLessThan(0.01);
            } else {
              expect(readings.transfer).toBeNull();
            }
          });
        }
      });
    }
  });
}
