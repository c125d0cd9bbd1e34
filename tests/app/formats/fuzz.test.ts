import { describe, expect, it } from 'vitest';
import { parseChannelMap } from '../../../app/capture/channelMap';
import fc from 'fast-check';
import { createCsvReader } from '../../../app/formats/csvReader';
import { parseComtradeConfig } from '../../../app/formats/comtradeConfigParse';
import { createComtradeDataReader } from '../../../app/formats/comtradeDataReader';
import { createComtradeCffReader } from '../../../app/formats/comtradeCffReader';
import { InputError } from '../../../app/errors';
import type { CaptureReader } from '../../../app/formats/captureReader';
import { joinBytes } from '../../helpers/joinBytes';
import { fixtureBytes } from './fixtureBytes';

/** Runs `action`; it may succeed, or fail with an InputError whose message starts with the source and says something. */
function onlyInputErrors(source: string, action: () => void): void {
  try {
    action();
  } catch (error) {
    if (!(error instanceof InputError)) throw error;
    expect(error.message.startsWith(source)).toBe(true);
    // More than the source: a sentence about what is wrong.
    expect(error.message.length).toBeGreaterThan(source.length + 10);
  }
}

function feed(reader: CaptureReader, bytes: Uint8Array, cuts: number[]): void {
  let previous = 0;
  for (const cut of [...cuts].map((cut) => cut % (bytes.length + 1)).sort((a, b) => a - b)) {
    reader.push(bytes.subarray(previous, cut));
    previous = cut;
  }
  reader.push(bytes.subarray(previous));
  reader.finish();
}

type Mutation = { kind: 'flip' | 'insert' | 'delete' | 'duplicate' | 'truncate'; at: number; length: number; bytes: Uint8Array };

const mutation: fc.Arbitrary<Mutation> = fc.record({
  kind: fc.constantFrom('flip', 'insert', 'delete', 'duplicate', 'truncate'),
  at: fc.nat(),
  length: fc.integer({ min: 1, max: 16 }),
  // Bytes that matter to these formats turn up more often than at random.
  bytes: fc.uint8Array({ minLength: 1, maxLength: 8 }).chain((random) =>
    fc.constantFrom(random, new TextEncoder().encode(','), new TextEncoder().encode('\n'), new TextEncoder().encode('-'), new TextEncoder().encode('9e999'), Uint8Array.of(0xff, 0xff, 0xff, 0xff)),
  ),
});

function mutate(original: Uint8Array, mutations: Mutation[]): Uint8Array {
  let bytes = original;
  for (const step of mutations) {
    const at = bytes.length === 0 ? 0 : step.at % bytes.length;
    const before = bytes.subarray(0, at);
    const after = bytes.subarray(at);
    if (step.kind === 'flip') {
      bytes = Uint8Array.from(bytes);
      step.bytes.forEach((value, index) => {
        if (at + index < bytes.length) bytes[at + index] ^= value;
      });
    } else if (step.kind === 'insert') bytes = joinBytes(before, step.bytes, after);
    else if (step.kind === 'delete') bytes = joinBytes(before, after.subarray(step.length));
    else if (step.kind === 'duplicate') bytes = joinBytes(before, after.subarray(0, step.length), after);
    else bytes = before;
  }
  return bytes;
}

const comtradeFixtures = [
  { base: 'unit-rw0142-ascii-1999', channelMap: undefined },
  { base: 'unit-rw0142-binary-2013', channelMap: undefined },
  { base: 'unit-rw0207-binary32-1999', channelMap: parseChannelMap('sync=TP1,ramp=TP2,gate=TP3') },
  { base: 'unit-rw0311-float32-2013', channelMap: undefined },
];

describe('fuzz: readers fail only with an InputError that names the problem', () => {
  it('CSV reader, random bytes', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 300 }), fc.array(fc.nat(), { maxLength: 4 }), fc.option(fc.constantFrom(1000, 50000)), (bytes, cuts, rate) => {
        onlyInputErrors('fuzz.csv', () => feed(createCsvReader({ source: 'fuzz.csv', blockSamples: 3, sampleRateHz: rate ?? undefined }), bytes, cuts));
      }),
      { numRuns: 600 },
    );
  });

  it('CSV reader, mutated fixtures', () => {
    const originals = [fixtureBytes('unit-rw0142.csv'), fixtureBytes('unit-rw0142-messy.csv')];
    fc.assert(
      fc.property(fc.constantFrom(...originals), fc.array(mutation, { minLength: 1, maxLength: 4 }), fc.array(fc.nat(), { maxLength: 3 }), (original, mutations, cuts) => {
        onlyInputErrors('fuzz.csv', () => feed(createCsvReader({ source: 'fuzz.csv', blockSamples: 2 }), mutate(original, mutations), cuts));
      }),
      { numRuns: 600 },
    );
  });

  it('COMTRADE configuration, random text and mutated fixtures', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 300 }), (text) => {
        onlyInputErrors('fuzz.cfg', () => parseComtradeConfig(text, 'fuzz.cfg'));
      }),
      { numRuns: 400 },
    );
    fc.assert(
      fc.property(fc.constantFrom(...comtradeFixtures), fc.array(mutation, { minLength: 1, maxLength: 4 }), (fixture, mutations) => {
        const text = new TextDecoder().decode(mutate(fixtureBytes(`${fixture.base}.cfg`), mutations));
        onlyInputErrors('fuzz.cfg', () => parseComtradeConfig(text, 'fuzz.cfg'));
      }),
      { numRuns: 600 },
    );
  });

  it('COMTRADE data, random and mutated .dat bytes against each fixture configuration', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...comtradeFixtures),
        fc.oneof(
          fc.uint8Array({ maxLength: 200 }).map((bytes) => ({ random: bytes, mutations: [] as Mutation[] })),
          fc.array(mutation, { minLength: 1, maxLength: 4 }).map((mutations) => ({ random: null, mutations })),
        ),
        fc.array(fc.nat(), { maxLength: 3 }),
        (fixture, input, cuts) => {
          const config = parseComtradeConfig(new TextDecoder().decode(fixtureBytes(`${fixture.base}.cfg`)));
          const bytes = input.random ?? mutate(fixtureBytes(`${fixture.base}.dat`), input.mutations);
          onlyInputErrors('fuzz.dat', () => feed(createComtradeDataReader(config, { source: 'fuzz.dat', channelMap: fixture.channelMap, blockSamples: 2 }), bytes, cuts));
        },
      ),
      { numRuns: 600 },
    );
  });

  it('COMTRADE pair, both files mutated together', () => {
    fc.assert(
      fc.property(fc.constantFrom(...comtradeFixtures), fc.array(mutation, { maxLength: 3 }), fc.array(mutation, { maxLength: 3 }), (fixture, configMutations, dataMutations) => {
        const text = new TextDecoder().decode(mutate(fixtureBytes(`${fixture.base}.cfg`), configMutations));
        onlyInputErrors('fuzz', () => {
          const config = parseComtradeConfig(text, 'fuzz.cfg');
          feed(createComtradeDataReader(config, { source: 'fuzz.dat', channelMap: fixture.channelMap }), mutate(fixtureBytes(`${fixture.base}.dat`), dataMutations), []);
        });
      }),
      { numRuns: 600 },
    );
  });

  it('COMTRADE single file (.cff), mutated', () => {
    const originals = [fixtureBytes('unit-rw0142-ascii-2013.cff'), fixtureBytes('unit-rw0142-binary-2013.cff')];
    fc.assert(
      fc.property(fc.constantFrom(...originals), fc.array(mutation, { minLength: 1, maxLength: 4 }), fc.array(fc.nat(), { maxLength: 3 }), (original, mutations, cuts) => {
        onlyInputErrors('fuzz.cff', () => feed(createComtradeCffReader({ source: 'fuzz.cff', blockSamples: 2 }), mutate(original, mutations), cuts));
      }),
      { numRuns: 400 },
    );
  });
});
