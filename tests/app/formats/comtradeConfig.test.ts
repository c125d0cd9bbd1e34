import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseComtradeConfig } from '../../../app/formats/comtradeConfigParse';
import { formatComtradeConfig } from '../../../app/formats/comtradeConfigFormat';
import { comtradeRecordBytes, type ComtradeConfig } from '../../../app/formats/comtradeConfig';
import { inputErrorOf as errorOf } from '../../helpers/inputError';
import { fixtureText } from './fixtureBytes';

// Field layout checked against IEEE C37.111 as summarised in REFERENCES.md.
describe('parseComtradeConfig: the field layout of both revisions', () => {
  it('reads a 1999 ASCII configuration field by field', () => {
    const config = parseComtradeConfig(fixtureText('unit-rw0142-ascii-1999.cfg'), 'unit-rw0142-ascii-1999.cfg');
    expect(config.stationName).toBe('Harrow Lane test bench');
    expect(config.recorderId).toBe('RW-LOGGER-07');
    expect(config.revision).toBe(1999);
    expect(config.analogChannels).toHaveLength(3);
    expect(config.digitalChannels).toHaveLength(1);
    expect(config.analogChannels[1]).toEqual({
      number: 2,
      id: 'RAMP',
      phase: '',
      circuit: 'TP2 ramp',
      unit: 'mV',
      multiplier: 0.5,
      offset: 100,
      skewUs: 0,
      minimum: -99999,
      maximum: 99998,
      primary: 1,
      secondary: 1,
      scaling: 'S',
    });
    expect(config.digitalChannels[0]).toEqual({ number: 1, id: 'gate', phase: '', circuit: 'TP3 gate', normalState: 0 });
    expect(config.lineFrequencyHz).toBe(50);
    expect(config.sampleRates).toEqual([{ rateHz: 10000, endSample: 5 }]);
    expect(config.firstSampleTime).toMatchObject({ year: 2026, month: 3, day: 14, hour: 9, minute: 15, second: 0 });
    expect(config.fileType).toBe('ASCII');
    expect(config.timeMultiplier).toBe(1);
    expect(config.timeBaseS).toBe(1e-6);
    expect(config.timeCode).toBeUndefined();
  });

  it('reads the 2013 extras: time_code, local_code, tmq_code, leapsec', () => {
    const config = parseComtradeConfig(fixtureText('unit-rw0142-binary-2013.cfg'));
    expect(config.revision).toBe(2013);
    expect(config.analogChannels[0]).toMatchObject({ id: 'sync', phase: 'A', primary: 200, secondary: 10, scaling: 'P' });
    expect(config.triggerTime.second).toBeCloseTo(0.0001, 12);
    expect(config.fileType).toBe('BINARY');
    expect(config).toMatchObject({ timeCode: '+1h', localCode: '+1h', timeQualityCode: '0', leapSecond: '0' });
    // Record: 4-byte number + 4-byte timestamp + 4 analogs x 2 bytes = 16 bytes.
    expect(comtradeRecordBytes(config)).toBe(16);
  });

  it('reads nrates 0 with its 0,endsamp line and a fractional timemult', () => {
    const config = parseComtradeConfig(fixtureText('unit-rw0311-float32-2013.cfg'));
    expect(config.sampleRates).toEqual([]);
    expect(config.endSampleWithoutRate).toBe(5);
    expect(config.timeMultiplier).toBe(0.5);
    expect(config.fileType).toBe('FLOAT32');
    expect(comtradeRecordBytes(config)).toBe(8 + 4 * 4);
  });

  it('packs digitals 16 to a word in the record size', () => {
    const config = parseComtradeConfig(fixtureText('unit-rw0207-binary32-1999.cfg'));
    expect(config.digitalChannels).toHaveLength(18);
    expect(config.digitalChannels[16].id).toBe('TP3');
    // 8 + 2 analogs x 4 bytes + ceil(18 / 16) = 2 words x 2 bytes = 20 bytes.
    expect(comtradeRecordBytes(config)).toBe(20);
  });

  it('reads the 1991 layout: no rev_year, 10-field analogs, 3-field digitals, mm/dd/yy dates', () => {
    const text = ['Old bench,REC1', '2,1A,1D', '1,sync,,,V,0.5,0,0,-32767,32767', '1,gate,0', '60', '1', '1000,10', '12/31/95,23:59:59.5', '12/31/95,23:59:59.5', 'BINARY'].join('\n');
    const config = parseComtradeConfig(text);
    expect(config.revision).toBe(1991);
    expect(config.analogChannels[0]).toMatchObject({ multiplier: 0.5, primary: 1, secondary: 1, scaling: 'P' });
    expect(config.digitalChannels[0]).toMatchObject({ id: 'gate', normalState: 0 });
    expect(config.firstSampleTime).toMatchObject({ year: 1995, month: 12, day: 31, second: 59.5 });
    expect(config.timeMultiplier).toBe(1);
  });

  it('takes nanosecond dates (nine decimals) as a nanosecond time base', () => {
    const text = fixtureText('unit-rw0311-float32-2013.cfg').replace(/10:00:00\.000000/g, '10:00:00.000000001');
    expect(parseComtradeConfig(text).timeBaseS).toBe(1e-9);
  });
});

describe('parseComtradeConfig: errors name the line and the field', () => {
  const valid = fixtureText('unit-rw0142-ascii-1999.cfg');
  const lines = valid.split('\r\n');
  const withLine = (index: number, text: string) => lines.map((line, at) => (at === index ? text : line)).join('\r\n');

  it('names a count that does not add up', () => {
    expect(errorOf(() => parseComtradeConfig(withLine(1, '5,3A,1D'), 'x.cfg')).message).toBe('x.cfg, line 2: TT is 5 but 3A + 1D make 4');
  });

  it('names a bad multiplier, a bad PS, a bad state', () => {
    expect(errorOf(() => parseComtradeConfig(withLine(2, '1,Sync,,TP1 sync,V,abc,0,0,-99999,99998,1,1,S'))).message).toContain('line 3: a (channel multiplier) is "abc", not a number');
    expect(errorOf(() => parseComtradeConfig(withLine(2, '1,Sync,,TP1 sync,V,0.01,0,0,-99999,99998,1,1,Q'))).message).toContain('PS is "Q"');
    expect(errorOf(() => parseComtradeConfig(withLine(5, '1,gate,,TP3 gate,2'))).message).toContain('line 6: y (normal state) is 2');
  });

  it('names a short analog line, a bad date, an unknown file type, a bad revision', () => {
    expect(errorOf(() => parseComtradeConfig(withLine(2, '1,Sync,,TP1 sync,V,0.01,0,0,-99999,99998'))).message).toContain('13 fields');
    expect(errorOf(() => parseComtradeConfig(withLine(9, '32/03/2026,09:15:00.000000'))).message).toContain('line 10: the first sample time "32/03/2026,09:15:00.000000" is not a valid date');
    expect(errorOf(() => parseComtradeConfig(withLine(11, 'BINARY64'))).message).toContain('line 12: the file type is "BINARY64"');
    expect(errorOf(() => parseComtradeConfig(withLine(0, 'a,b,19x9'))).message).toContain('rev_year is "19x9"');
  });

  it('says where a file ends early, and when it is empty', () => {
    expect(errorOf(() => parseComtradeConfig(lines.slice(0, 4).join('\n'))).message).toContain('ends early: expected analog channel 3 on line 5');
    expect(errorOf(() => parseComtradeConfig('  \r\n')).message).toContain('empty');
  });
});

describe('formatComtradeConfig', () => {
  it('writes what parseComtradeConfig reads back, for both revisions', () => {
    for (const name of ['unit-rw0142-ascii-1999.cfg', 'unit-rw0142-binary-2013.cfg', 'unit-rw0207-binary32-1999.cfg', 'unit-rw0311-float32-2013.cfg']) {
      const config = parseComtradeConfig(fixtureText(name));
      const again = parseComtradeConfig(formatComtradeConfig(config));
      const withoutText = (value: ComtradeConfig) => ({ ...value, firstSampleTime: { ...value.firstSampleTime, text: '' }, triggerTime: { ...value.triggerTime, text: '' } });
      expect(withoutText(again)).toEqual(withoutText(config));
    }
  });

  it('round-trips arbitrary channel scalings and names exactly', () => {
    const finite = fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e12, max: 1e12 });
    fc.assert(
      fc.property(
        fc.array(fc.record({ id: fc.string({ maxLength: 12 }), multiplier: finite.filter((value) => value !== 0), offset: finite }), { minLength: 1, maxLength: 5 }),
        fc.constantFrom(1999 as const, 2013 as const),
        (channels, revision) => {
          const base = parseComtradeConfig(fixtureText('unit-rw0311-float32-2013.cfg'));
          const config: ComtradeConfig = {
            ...base,
            revision,
            analogChannels: channels.map((channel, index) => ({ ...base.analogChannels[0], number: index + 1, id: channel.id, multiplier: channel.multiplier, offset: channel.offset })),
          };
          const again = parseComtradeConfig(formatComtradeConfig(config));
          again.analogChannels.forEach((channel, index) => {
            expect(channel.multiplier).toBe(channels[index].multiplier);
            expect(Object.is(channel.offset, channels[index].offset) || channel.offset === channels[index].offset).toBe(true);
            // Commas and line breaks would shift fields, so they are written as spaces; the reader trims ids.
            expect(channel.id).toBe(channels[index].id.replace(/[,\r\n]/g, ' ').trim());
          });
        },
      ),
      { numRuns: 300 },
    );
  });
});
