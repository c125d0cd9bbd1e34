/** fast-check generators of valid board designs (schema-valid and with a conducting transistor), for property tests. */
import fc from 'fast-check';
import { type BoardDesign, boardDesignSchema } from '../../../app/board/design';

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
