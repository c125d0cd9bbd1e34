import { describe, expect, it } from 'vitest';
import { SampleHistory } from '../../../app/signal/sampleHistory';

describe('SampleHistory', () => {
  it('cuts windows by stream sample number across appends, growth and discards', () => {
    const history = new SampleHistory({ initialCapacity: 16 });
    history.reset(100);
    for (let block = 0; block < 10; block++) history.append(Float64Array.from({ length: 7 }, (_, i) => 100 + block * 7 + i));
    // Values equal their sample numbers, so every cut can be checked against its own numbering.
    const cut = history.window(120.5, 130);
    expect(cut.firstIndex).toBe(120);
    expect(Array.from(cut.values)).toEqual([120, 121, 122, 123, 124, 125, 126, 127, 128, 129]);
    history.discardBefore(150);
    expect(history.startIndex).toBe(150);
    expect(history.endIndex).toBe(170);
    // Asking for discarded samples gives only what is held.
    const clipped = history.window(140, 155);
    expect(clipped.firstIndex).toBe(150);
    expect(Array.from(clipped.values)).toEqual([150, 151, 152, 153, 154]);
    history.append([170, 171]);
    expect(Array.from(history.window(168, 172).values)).toEqual([168, 169, 170, 171]);
    expect(history.window(200, 210).values).toHaveLength(0);
  });
});
