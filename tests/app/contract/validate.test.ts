// The contract's edge: malformed payloads and unknown calls are refused with a message naming the field.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { BenchFault, benchCalls, callNames, parseCallName, parseCallPayload } from '../../../app/contract';

function refusal(run: () => unknown): BenchFault {
  try {
    run();
  } catch (error) {
    if (error instanceof BenchFault) return error;
    throw error;
  }
  throw new Error('expected a refusal');
}

describe('parseCallPayload', () => {
  it('names the missing field of startSession', () => {
    const fault = refusal(() => parseCallPayload('startSession', { unitSerial: 'CH-0142', operator: 'Ines' }));
    expect(fault.code).toBe('invalid-payload');
    expect(fault.message).toContain('designName');
  });

  it('refuses an empty unit serial with words a technician reads', () => {
    const fault = refusal(() => parseCallPayload('startSession', { unitSerial: '   ', designName: 'HW-24', operator: 'Ines' }));
    expect(fault.message).toMatch(/unitSerial: the unit serial must not be empty/);
  });

  it('refuses unknown extra fields (strict payloads catch typos)', () => {
    const fault = refusal(() => parseCallPayload('setHold', { held: true, hold: false }));
    expect(fault.message).toMatch(/hold/);
  });

  it('refuses a virtual board without a design', () => {
    const fault = refusal(() => parseCallPayload('connect', { kind: 'virtual', faults: [] }));
    expect(fault.message).toMatch(/designName or a design/);
  });

  it('refuses an unknown link kind', () => {
    expect(refusal(() => parseCallPayload('connect', { kind: 'bluetooth' })).code).toBe('invalid-payload');
  });

  it('refuses a negative session id and a non-number one', () => {
    expect(refusal(() => parseCallPayload('sessionDetail', { sessionId: -3 })).message).toMatch(/sessionId/);
    expect(refusal(() => parseCallPayload('sessionDetail', { sessionId: '7' })).message).toMatch(/sessionId/);
  });

  it('refuses a design with a zero emitter resistor, naming the field path', () => {
    const design = {
      name: 'HW-24',
      mainsHz: 50,
      rectifier: 'half-wave',
      supplyV: 15,
      rampTargetV: 6,
      alphaMaxDeg: 165,
      parts: { rEmitter: { ohm: 0 }, rBiasTop: { ohm: 22000 }, rBiasBottom: { ohm: 100000 }, cRamp: { farad: 4.7e-7 } },
    };
    const fault = refusal(() => parseCallPayload('saveDesign', { design }));
    expect(fault.message).toContain('design.parts.rEmitter.ohm');
    expect(fault.message).toContain('must be from 1R0 to 10M');
  });

  it('fills defaults the caller may leave out', () => {
    expect(parseCallPayload('trimPlan', {})).toEqual({ series: 'E24' });
    expect(parseCallPayload('keepCapture', {})).toEqual({ seconds: 2 });
    expect(parseCallPayload('listPorts', undefined)).toEqual({});
  });

  it('never throws anything but a BenchFault for any JSON value on any call (property)', () => {
    fc.assert(
      fc.property(fc.constantFrom(...callNames), fc.jsonValue(), (call, payload) => {
        try {
          parseCallPayload(call, payload);
        } catch (error) {
          expect(error).toBeInstanceOf(BenchFault);
          expect((error as BenchFault).message.length).toBeGreaterThan(0);
        }
      }),
      { numRuns: 400 },
    );
  });
});

describe('parseCallName', () => {
  it('knows every call of the list and nothing else', () => {
    for (const name of callNames) expect(parseCallName(name)).toBe(name);
    expect(refusal(() => parseCallName('deleteEverything')).code).toBe('unknown-call');
    expect(refusal(() => parseCallName('__proto__')).code).toBe('unknown-call');
    expect(refusal(() => parseCallName('toString')).code).toBe('unknown-call');
    expect(refusal(() => parseCallName(42)).code).toBe('unknown-call');
  });

  it('has a purpose for every call', () => {
    for (const name of callNames) expect(benchCalls[name].purpose.length).toBeGreaterThan(10);
  });
});
