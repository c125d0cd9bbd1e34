/**
 * One second of a full-wave 50 Hz board at 50 kS/s on 4 channels (sync, ramp, gate, control) with 5 mV of noise, a
 * whole number of mains cycles so it repeats seamlessly, for the benchmarks: as sample blocks, or written straight
 * to a CSV file of any length (times to 1 ns as our writer prints them; volts in shortest form or fixed decimals).
 */
import { once } from 'node:events';
import { createWriteStream } from 'node:fs';
import type { SampleBlock } from '../../../app/capture/samples';

export const benchSampleRateHz = 50_000;
const mainsHz = 50;
const blockSamples = 4096;

export interface OneSecond {
  sync: Float64Array;
  ramp: Float64Array;
  gate: Float64Array;
  control: Float64Array;
}

export function oneSecond(): OneSecond {
  let seed = 12345;
  const uniform = (): number => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed / 2147483648;
  };
  const noise = (): number => 0.005 * Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  const sync = new Float64Array(benchSampleRateHz);
  const ramp = new Float64Array(benchSampleRateHz);
  const gate = new Float64Array(benchSampleRateHz);
  const control = new Float64Array(benchSampleRateHz);
  for (let i = 0; i < benchSampleRateHz; i++) {
    const timeS = i / benchSampleRateHz;
    const halfCycle = (timeS * mainsHz * 2) % 1;
    sync[i] = 5 * Math.sin(2 * Math.PI * mainsHz * timeS) + noise();
    ramp[i] = (halfCycle < 0.015 || halfCycle > 0.985 ? 0.2 : 0.2 + 8 * (halfCycle - 0.015)) + noise();
    gate[i] = (halfCycle > 0.5 && halfCycle < 0.52 ? 12 : 0) + noise();
    control[i] = 4.2 + noise();
  }
  return { sync, ramp, gate, control };
}

const second = oneSecond();

export function* syntheticBlocks(durationS: number): Generator<SampleBlock> {
  const total = durationS * benchSampleRateHz;
  for (let first = 0; first < total; first += blockSamples) {
    const length = Math.min(blockSamples, total - first);
    const offset = first % benchSampleRateHz;
    const take = (source: Float64Array): Float64Array => {
      if (offset + length <= benchSampleRateHz) return source.subarray(offset, offset + length);
      const out = new Float64Array(length);
      for (let i = 0; i < length; i++) out[i] = source[(offset + i) % benchSampleRateHz];
      return out;
    };
    yield { startS: first / benchSampleRateHz, sampleRateHz: benchSampleRateHz, sync: take(second.sync), ramp: take(second.ramp), gate: take(second.gate), control: take(second.control), afterGap: false };
  }
}

/**
 * Writes `durationS` seconds as our CSV (`t,sync,ramp,gate,control`), the volts of one second formatted once and
 * repeated: fast enough for a gigabyte. `voltDecimals` undefined prints the shortest exact form, as our writer does.
 */
export async function writeSyntheticCsv(path: string, durationS: number, voltDecimals?: number): Promise<number> {
  const format = (value: number): string => (voltDecimals === undefined ? String(value) : value.toFixed(voltDecimals));
  const volts: string[] = [];
  for (let i = 0; i < benchSampleRateHz; i++) volts.push(`,${format(second.sync[i])},${format(second.ramp[i])},${format(second.gate[i])},${format(second.control[i])}\n`);
  const nanosecondsPerSample = 1e9 / benchSampleRateHz;
  const stream = createWriteStream(path);
  let bytes = 0;
  const write = async (text: string): Promise<void> => {
    bytes += text.length;
    if (!stream.write(text)) await once(stream, 'drain');
  };
  await write('t,sync,ramp,gate,control\n');
  for (let secondIndex = 0; secondIndex < durationS; secondIndex++) {
    let text = '';
    for (let i = 0; i < benchSampleRateHz; i++) {
      text += `${secondIndex}.${String(i * nanosecondsPerSample).padStart(9, '0')}${volts[i]}`;
      if (text.length > 1 << 20) {
        await write(text);
        text = '';
      }
    }
    await write(text);
  }
  stream.end();
  await once(stream, 'finish');
  return bytes;
}
