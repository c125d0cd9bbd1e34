import { describe, expect, it } from 'vitest';
import { describeLinkSource } from '../../../app/contract/readings';

describe('link source in words', () => {
  it('names the serial device or the virtual board with its faults, never raw data', () => {
    expect(describeLinkSource({ kind: 'serial', path: '/dev/ttyACM0' })).toBe('logger on /dev/ttyACM0');
    expect(describeLinkSource({ kind: 'virtual', designName: 'Heater HT-60F', faults: [] })).toBe('virtual board (Heater HT-60F)');
    expect(describeLinkSource({ kind: 'virtual', designName: 'Heater HT-60F', faults: ['capacitor-low', 'noisy-sync'] })).toBe(
      'virtual board (Heater HT-60F, fault: capacitor-low, noisy-sync)',
    );
  });
});
