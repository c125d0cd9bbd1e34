/** fast-check generators of valid board designs (schema-valid and with a conducting transistor), for property tests. */
import fc from 'fast-check';
import { type BoardDesign, boardDesignSchema } from '../../../app/board/design';
import { designRanges } from '../../../app/board/designRanges';
import { parseBoardDesign } from '../../../app/board/parseBoardDesign';
import { InputError } from '../../../app/errors';

export const designArbitrary: fc.Arbitrary<BoardDesign> = fc
  .record({
    mainsHz: fc.double({ min: 45, max: 65, noNaN: true }),
    rectifier: fc.constantFrom('half-wave' as const, 'full-wave' as const),
    supplyV: fc.double({ min: 5, max: 48, noNaN: true }),
    emitterOhm: fc.double({ min: 300, max: 300_000, noNaN: true }),
    topOhm: fc.double({ min: 1000, max: 200_000, noNaN: true }),
    bottomOhm: fc.double({ min: 1000, max: 1_000_000, noNaN: true }),
    farad: fc.double({ min: 1e-8, max: 1e-5, noNaN: true }),
    vebV: fc.double({ min: 0.5, max: 0.75, noNaN: true }),
    beta: fc.double({ min: 30, max: 500, noNaN: true }),
    earlyV: fc.double({ min: 15, max: 200, noNaN: true }),
    // A full-wave board needs some reset time to discharge the capacitor at all (100 us and up, common practice).
    resetUs: fc.double({ min: 100, max: 1000, noNaN: true }),
  })
  .filter((draw) => (draw.supplyV * draw.bottomOhm) / (draw.topOhm + draw.bottomOhm) + draw.vebV + 0.05 < draw.supplyV)
  .map((draw) =>
    boardDesignSchema.parse({
      name: 'property board',
      mainsHz: draw.mainsHz,
      rectifier: draw.rectifier,
      supplyV: draw.supplyV,
      rampTargetV: draw.supplyV / 2,
      alphaMaxDeg: 150,
      syncResetUs: draw.resetUs,
      parts: {
        rEmitter: { ohm: draw.emitterOhm },
        rBiasTop: { ohm: draw.topOhm },
        rBiasBottom: { ohm: draw.bottomOhm },
        cRamp: { farad: draw.farad },
      },
      transistor: { vebV: draw.vebV, beta: draw.beta, earlyV: draw.earlyV },
    }),
  );

/** A number drawn evenly on a log scale between `min` and `max` (both above 0), ends included now and then. */
function logUniform(min: number, max: number): fc.Arbitrary<number> {
  return fc.oneof(
    { weight: 8, arbitrary: fc.double({ min: Math.log(min), max: Math.log(max), noNaN: true }).map((logValue) => Math.min(max, Math.max(min, Math.exp(logValue)))) },
    { weight: 1, arbitrary: fc.constantFrom(min, max) },
  );
}

/**
 * Designs drawn over the whole of every physical range (app/board/designRanges.ts), ends included, kept when
 * parseBoardDesign accepts them (schema and physics): any design a user could load, not only typical ones.
 */
export const anyValidDesignArbitrary: fc.Arbitrary<BoardDesign> = fc
  .record({
    mainsHz: fc.double({ min: 45, max: 65, noNaN: true }),
    rectifier: fc.constantFrom('half-wave' as const, 'full-wave' as const),
    supplyV: logUniform(designRanges.supplyV.min, designRanges.supplyV.max),
    targetShare: fc.double({ min: 0.05, max: 0.95, noNaN: true }),
    emitterOhm: logUniform(designRanges.resistorOhm.min, designRanges.resistorOhm.max),
    topOhm: logUniform(designRanges.resistorOhm.min, designRanges.resistorOhm.max),
    bottomOhm: logUniform(designRanges.resistorOhm.min, designRanges.resistorOhm.max),
    farad: logUniform(designRanges.rampCapacitorFarad.min, designRanges.rampCapacitorFarad.max),
    dischargeOhm: fc.option(logUniform(designRanges.resistorOhm.min, designRanges.resistorOhm.max), { nil: undefined }),
    control: fc.option(fc.record({ top: logUniform(designRanges.resistorOhm.min, designRanges.resistorOhm.max), pot: logUniform(designRanges.resistorOhm.min, designRanges.resistorOhm.max) }), { nil: undefined }),
    vebV: fc.double({ min: 0.3, max: 1, noNaN: true }),
    beta: logUniform(10, 2000),
    earlyV: logUniform(designRanges.earlyV.min, designRanges.earlyV.max),
    vecSatV: fc.double({ min: 0, max: 2, noNaN: true }),
    resetUs: fc.double({ min: 0, max: 5000, noNaN: true }),
    gatePulseUs: logUniform(designRanges.gatePulseUs.min, designRanges.gatePulseUs.max),
    syncPhaseDeg: fc.double({ min: -90, max: 90, noNaN: true }),
    alphaMinDeg: fc.double({ min: 0, max: 90, noNaN: true }),
    alphaMaxDeg: fc.double({ min: 1, max: 180, noNaN: true }),
    tolerancePct: logUniform(designRanges.rampPeakTolerancePct.min, designRanges.rampPeakTolerancePct.max),
    alphaToleranceDeg: logUniform(designRanges.angleToleranceDeg.min, designRanges.angleToleranceDeg.max),
  })
  .map((draw) => {
    const json = {
      name: 'wide property board',
      mainsHz: draw.mainsHz,
      rectifier: draw.rectifier,
      supplyV: draw.supplyV,
      rampTargetV: Math.max(designRanges.rampTargetV.min, draw.supplyV * draw.targetShare),
      alphaMinDeg: draw.alphaMinDeg,
      alphaMaxDeg: draw.alphaMaxDeg,
      syncPhaseDeg: draw.syncPhaseDeg,
      syncResetUs: draw.resetUs,
      gatePulseUs: draw.gatePulseUs,
      parts: {
        rEmitter: { ohm: draw.emitterOhm },
        rBiasTop: { ohm: draw.topOhm },
        rBiasBottom: { ohm: draw.bottomOhm },
        cRamp: { farad: draw.farad },
        ...(draw.dischargeOhm !== undefined ? { rDischarge: { ohm: draw.dischargeOhm } } : {}),
        ...(draw.control !== undefined ? { rControlTop: { ohm: draw.control.top }, potControl: { ohm: draw.control.pot } } : {}),
      },
      transistor: { vebV: draw.vebV, beta: draw.beta, earlyV: draw.earlyV, vecSatV: draw.vecSatV },
      tolerances: { rampPeakPct: draw.tolerancePct, alphaDeg: draw.alphaToleranceDeg, startDelayDeg: draw.alphaToleranceDeg },
    };
    try {
      return parseBoardDesign(json);
    } catch (error) {
      if (error instanceof InputError) return null;
      throw error;
    }
  })
  .filter((design): design is BoardDesign => design !== null);
