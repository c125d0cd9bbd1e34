import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { channelMapSchema, formatChannelMap, parseChannelMap, type ChannelMap } from '../../../app/capture/channelMap';
import { resolveChannelRoles, type FileChannel } from '../../../app/capture/resolveChannels';
import { inputErrorOf as errorOf } from '../../helpers/inputError';

describe('parseChannelMap: the --map text', () => {
  it('reads names, numbers, scales and inversions', () => {
    expect(parseChannelMap('sync=CH1, ramp=CH2:x10 ,gate=3:invert,control=CH4:x0.5:invert,time=none')).toEqual({
      sync: { channel: 'CH1', scale: 1, invert: false },
      ramp: { channel: 'CH2', scale: 10, invert: false },
      gate: { channel: 3, scale: 1, invert: true },
      control: { channel: 'CH4', scale: 0.5, invert: true },
      time: null,
    });
  });

  it('keeps a quoted name whole, even a number or one with a comma or colon', () => {
    expect(parseChannelMap('sync="2",ramp="Ramp, TP4:x",gate=Gate (V)')).toEqual({
      sync: { channel: '2', scale: 1, invert: false },
      ramp: { channel: 'Ramp, TP4:x', scale: 1, invert: false },
      gate: { channel: 'Gate (V)', scale: 1, invert: false },
    });
  });

  it('names what is wrong, with the option', () => {
    expect(errorOf(() => parseChannelMap('sync=CH1,ramp')).message).toBe('--map: "ramp" is not role=channel (e.g. sync=CH1)');
    expect(errorOf(() => parseChannelMap('trigger=CH1')).message).toContain('"trigger" is not a role: use sync, ramp, gate, control or time');
    expect(errorOf(() => parseChannelMap('sync=CH1,SYNC=CH2')).message).toContain('sync is given twice');
    expect(errorOf(() => parseChannelMap('ramp=CH2:x0')).message).toContain('the scale x0 must be x followed by a number above 0');
    expect(errorOf(() => parseChannelMap('ramp=CH2:flip')).message).toContain('":flip" is not a scale (x10) or invert');
    expect(errorOf(() => parseChannelMap('ramp=0')).message).toContain('channel numbers count from 1');
    expect(errorOf(() => parseChannelMap(' , ')).message).toContain('the channel map is empty');
  });

  it('reads back what formatChannelMap writes, for any map', () => {
    const channel = fc.oneof(fc.integer({ min: 1, max: 64 }), fc.stringMatching(/^[A-Za-z][A-Za-z0-9 _().,:-]{0,12}[A-Za-z0-9)]$/));
    const pick = fc.record({ channel, scale: fc.constantFrom(1, 10, 0.5, 100, 2.5), invert: fc.boolean() });
    const map = fc.record({ sync: pick, ramp: pick, gate: pick, control: fc.option(pick, { nil: undefined }) }, { requiredKeys: ['sync', 'ramp', 'gate'] });
    fc.assert(
      fc.property(map, (value) => {
        const cleaned = JSON.parse(JSON.stringify(value)) as ChannelMap;
        expect(parseChannelMap(formatChannelMap(cleaned))).toEqual(cleaned);
      }),
      { numRuns: 300 },
    );
  });

  it('a design stores the short form or the long one, normalised alike', () => {
    expect(channelMapSchema.parse({ sync: 'CH1', ramp: { channel: 2, scale: 10 }, gate: { channel: 'CH3', invert: true } })).toEqual({
      sync: { channel: 'CH1', scale: 1, invert: false },
      ramp: { channel: 2, scale: 10, invert: false },
      gate: { channel: 'CH3', scale: 1, invert: true },
    });
    expect(channelMapSchema.safeParse({ ramp: { channel: 'CH2', scale: -10 } }).success).toBe(false);
    expect(channelMapSchema.safeParse({ trigger: 'CH2' }).success).toBe(false);
  });
});

describe('resolveChannelRoles: never two readings', () => {
  const columns: FileChannel[] = [
    { number: 1, names: ['Time (s)', 'Time'], label: 'Time (s)' },
    { number: 2, names: ['CH1 (V)', 'CH1'], label: 'CH1 (V)' },
    { number: 3, names: ['CH2 (V)', 'CH2'], label: 'CH2 (V)' },
    { number: 4, names: ['3'], label: '3' },
    { number: 5, names: ['ch1'], label: 'ch1' },
  ];

  it('finds by name without case or unit, and by number', () => {
    const roles = resolveChannelRoles(columns, parseChannelMap('sync=CH2 (V),ramp=time,gate=4'), 'f.csv, line 3');
    expect(roles.sync?.channel.number).toBe(3);
    expect(roles.ramp?.channel.number).toBe(1);
    expect(roles.gate?.channel.number).toBe(4);
    expect(roles.control).toBeNull();
  });

  it('refuses a number that is one column\'s position and another\'s name, and a name two columns share', () => {
    expect(errorOf(() => resolveChannelRoles(columns, parseChannelMap('sync=3,ramp=CH2,gate=4'), 'f.csv, line 3')).message).toBe(
      'f.csv, line 3: sync=3 could mean CH2 (V) (number 3) or 3 (named "3"): write sync="3" in --map for the name',
    );
    expect(errorOf(() => resolveChannelRoles(columns, parseChannelMap('sync=CH1,ramp=CH2,gate=4'), 'f.csv, line 3')).message).toContain(
      'sync: "CH1" fits CH1 (V) and ch1: name the one you mean by its number in --map',
    );
  });

  it('refuses one channel for two roles', () => {
    expect(errorOf(() => resolveChannelRoles(columns, parseChannelMap('sync=2,ramp=CH2,gate=CH2 (V)'), 'f')).message).toContain('CH2 (V) is given for both ramp and gate');
  });
});
