// The data folder by platform, the virtual board as a link source (fitting parts), the pipeline under link
// faults, and the predicted ramp drawn on the Trim screen.
import { describe, expect, it } from 'vitest';
import { parseBoardDesign } from '../../../app/board/parseBoardDesign';
import { predictRamp } from '../../../app/board/rampModel';
import { wrongEmitterFactor } from '../../../app/sim/fittedBoard';
import { createBenchPipeline } from '../../../main/session/benchPipeline';
import { userDataFolder } from '../../../main/session/dataFolder';
import { createVirtualSource } from '../../../main/session/virtualSource';
import { predictedRampTrace } from '../../../main/session/trimView';
import { designFileName, validateDesignInput } from '../../../main/session/designCatalog';

const design = parseBoardDesign({
  name: 'Test board FW-60',
  mainsHz: 60,
  rectifier: 'full-wave',
  supplyV: 15,
  rampTargetV: 5,
  alphaMaxDeg: 160,
  parts: { rEmitter: { ohm: 10000, ref: 'R3' }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 2.2e-7 } },
});

describe('userDataFolder', () => {
  it('follows XDG on Linux, %APPDATA% on Windows, Application Support on macOS', () => {
    expect(userDataFolder({ platform: 'linux', env: { XDG_DATA_HOME: '/srv/data' }, home: '/home/tess' })).toBe('/srv/data/rampwright');
    // XDG Base Directory spec: unset, empty or relative means ~/.local/share.
    expect(userDataFolder({ platform: 'linux', env: {}, home: '/home/tess' })).toBe('/home/tess/.local/share/rampwright');
    expect(userDataFolder({ platform: 'linux', env: { XDG_DATA_HOME: 'relative/path' }, home: '/home/tess' })).toBe('/home/tess/.local/share/rampwright');
    expect(userDataFolder({ platform: 'darwin', env: {}, home: '/Users/tess' })).toBe('/Users/tess/Library/Application Support/Rampwright');
    expect(userDataFolder({ platform: 'win32', env: { APPDATA: 'C:/Users/tess/AppData/Roaming' }, home: 'C:/Users/tess' })).toMatch(/AppData.Roaming.Rampwright$/);
  });
});

describe('virtual source', () => {
  it('produces protocol lines only when pumped, starting with a greeting', () => {
    const lines: string[] = [];
    const source = createVirtualSource({ design, faults: [], paced: false });
    source.start({ lines: (batch) => lines.push(...batch), ended: () => undefined });
    expect(lines).toEqual([]);
    source.pump(0.1);
    expect(lines[0].startsWith('H ')).toBe(true);
    // 0.1 s at 25 kS/s in 120-sample data lines: about 21 lines (PROTOCOL.md block size).
    expect(lines.filter((line) => line.startsWith('D ')).length).toBeGreaterThanOrEqual(20);
    source.stop();
  });

  it('solders a parallel resistor across the part actually fitted, not the design value', () => {
    const source = createVirtualSource({ design, faults: ['wrong-emitter-resistor'], paced: false });
    const actualOhm = design.parts.rEmitter.ohm * wrongEmitterFactor;
    const fitted = source.fitResistor('rEmitter', { method: 'parallel', toOhm: 5000, addOhm: 10000 });
    // Parallel resistance R1 R2 / (R1 + R2) of the wrong 15 kohm part and the added 10 kohm: 6 kohm.
    expect(fitted).toBeCloseTo((actualOhm * 10000) / (actualOhm + 10000), 6);
    expect(source.description).toMatchObject({ kind: 'virtual', faults: [] });
    expect(source.fitResistor('rEmitter', { method: 'replace', toOhm: 9100, addOhm: null })).toBe(9100);
    expect(() => source.fitResistor('rEmitter', { method: 'series', toOhm: 1, addOhm: null })).toThrow(/added resistor/);
  });

  it('refuses an unknown fault by name', () => {
    expect(() => createVirtualSource({ design, faults: ['gremlins'], paced: false })).toThrow(/gremlins/);
  });
});

describe('bench pipeline under link faults', () => {
  it('counts dropped lines as lost samples and never folds a cycle across a gap', () => {
    const pipeline = createBenchPipeline(design, { windowS: 0.5 });
    const source = createVirtualSource({ design, faults: ['drop-blocks'], paced: false, seed: 5 });
    let cycles = 0;
    source.start({ lines: (batch) => (cycles += pipeline.pushLines(batch).cycles.length), ended: () => undefined });
    source.pump(3);
    const health = pipeline.decoderHealth();
    expect(health.blocksLost).toBeGreaterThan(0);
    expect(health.samplesLost).toBe(health.blocksLost * 120);
    expect(cycles).toBeGreaterThan(20);
    // A folded cycle covers one period (60 Hz: 16.7 ms) without a hole: a lost 120-sample line would leave one of
    // 4.8 ms (104 degrees); the fold's buckets are 1.5 degrees wide, so neighbours are at most two buckets apart.
    expect(pipeline.fold().length).toBeGreaterThan(5);
    for (const folded of pipeline.fold()) {
      expect(folded.periodMs).toBeCloseTo(1000 / 60, 0);
      const steps = folded.sync.deg.slice(1).map((deg, index) => deg - folded.sync.deg[index]);
      expect(Math.max(...steps)).toBeLessThan(3);
      expect(folded.sync.deg[folded.sync.deg.length - 1]).toBeGreaterThan(357);
    }
  });
});

describe('predictedRampTrace', () => {
  it('runs from the ramp start to the end of the charging interval and ends at the predicted peak', () => {
    const prediction = predictRamp(design, { partOverrides: { rEmitter: 9100 } });
    const trace = predictedRampTrace(design, { part: 'rEmitter', toOhm: 9100, toFarad: null, predictedPeakV: 5.4, alsoChange: null }, 30);
    expect(trace.deg).toHaveLength(31);
    expect(trace.deg[0]).toBeCloseTo(360 * 60 * prediction.startDelayS, 9);
    expect(trace.deg[30]).toBeCloseTo(360 * 60 * (prediction.startDelayS + prediction.chargingIntervalS), 9);
    expect(trace.v[0]).toBeCloseTo(prediction.floorV, 9);
    expect(trace.v[30]).toBeCloseTo(5.4, 9);
  });
});

describe('design catalogue helpers', () => {
  it('names design files after the design', () => {
    expect(designFileName('Charger firing board CH-50H (demo)')).toBe('charger-firing-board-ch-50h-demo.board.json');
    expect(designFileName('***')).toBe('design.board.json');
  });

  it('validates a design as typed: schema problems by field, physics problems by field', () => {
    expect(validateDesignInput(design)).toMatchObject({ ok: true });
    const schema = validateDesignInput({ ...design, mainsHz: 400 });
    expect(schema.ok).toBe(false);
    expect(schema.problems[0].field).toBe('mainsHz');
    const physics = validateDesignInput({ ...design, rampTargetV: 40 });
    expect(physics.ok).toBe(false);
    expect(physics.problems.some((problem) => problem.field === 'rampTargetV')).toBe(true);
  });
});
