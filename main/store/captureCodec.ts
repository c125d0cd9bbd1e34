/**
 * Stored captures: the raw samples of a chosen stretch, exactly as analysed (float64 volts, so every reading can be
 * recomputed bit for bit), channel after channel, little-endian, deflated with zlib. The sha-256 is taken over the
 * raw bytes before compression, so a commissioning record can quote it and anyone can check it against the logbook.
 */
import { createHash } from 'node:crypto';
import { deflateSync, inflateSync } from 'node:zlib';
import { InputError } from '../../app/errors';
import type { SampleBlock, SignalRole } from '../../app/capture/samples';

export const captureEncoding = 'f64le-planar+zlib';

export interface EncodedCapture {
  roles: SignalRole[];
  samplesPerChannel: number;
  sha256: string;
  data: Buffer;
}

function rolesOf(block: SampleBlock): SignalRole[] {
  return block.control ? ['sync', 'ramp', 'gate', 'control'] : ['sync', 'ramp', 'gate'];
}

function channel(block: SampleBlock, role: SignalRole): Float64Array {
  const values = role === 'control' ? block.control : block[role];
  if (!values) throw new Error(`capture has no ${role} channel`);
  return values;
}

export function rawCaptureBytes(block: SampleBlock): Buffer {
  const roles = rolesOf(block);
  const length = block.sync.length;
  const raw = Buffer.alloc(roles.length * length * 8);
  roles.forEach((role, index) => {
    const values = channel(block, role);
    if (values.length !== length) throw new Error(`capture channel ${role} has ${values.length} samples, sync has ${length}`);
    for (let i = 0; i < length; i += 1) raw.writeDoubleLE(values[i], (index * length + i) * 8);
  });
  return raw;
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

export function encodeCapture(block: SampleBlock): EncodedCapture {
  const raw = rawCaptureBytes(block);
  return { roles: rolesOf(block), samplesPerChannel: block.sync.length, sha256: sha256Hex(raw), data: deflateSync(raw) };
}

export interface DecodeCaptureInput {
  roles: SignalRole[];
  samplesPerChannel: number;
  sha256: string;
  data: Uint8Array;
  startS: number;
  sampleRateHz: number;
  afterGap: boolean;
  where: string;
}

/** Most raw sample bytes one capture may declare: 1 GiB (an hour of four channels at 4.6 kS/s; our rule). */
export const maxCaptureBytes = 1024 * 1024 * 1024;

export function decodeCapture(input: DecodeCaptureInput): SampleBlock {
  // The capture's own header says how many bytes its samples take; inflating stops there, so data that would
  // expand further (a decompression bomb) costs no more memory than the capture it claims to be.
  const declaredBytes = input.roles.length * input.samplesPerChannel * 8;
  if (!(declaredBytes <= maxCaptureBytes)) {
    throw new InputError(`stored capture declares ${input.samplesPerChannel} samples per channel, more than this program reads (${maxCaptureBytes / 1024 ** 3} GiB of samples)`, input.where);
  }
  let raw: Buffer;
  try {
    raw = inflateSync(input.data, { maxOutputLength: Math.max(1, declaredBytes) });
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ERR_BUFFER_TOO_LARGE') {
      throw new InputError(`stored capture expands beyond its declared size (${declaredBytes} bytes of samples)`, input.where);
    }
    throw new InputError('stored capture is damaged (cannot be decompressed)', input.where);
  }
  if (raw.length !== input.roles.length * input.samplesPerChannel * 8 || sha256Hex(raw) !== input.sha256) {
    throw new InputError('stored capture does not match its sha-256: the samples were altered or damaged', input.where);
  }
  const length = input.samplesPerChannel;
  const channels = new Map<SignalRole, Float64Array>();
  input.roles.forEach((role, index) => {
    const values = new Float64Array(length);
    for (let i = 0; i < length; i += 1) values[i] = raw.readDoubleLE((index * length + i) * 8);
    channels.set(role, values);
  });
  const get = (role: SignalRole): Float64Array => channels.get(role) ?? new Float64Array(length);
  return {
    startS: input.startS,
    sampleRateHz: input.sampleRateHz,
    sync: get('sync'),
    ramp: get('ramp'),
    gate: get('gate'),
    control: channels.get('control') ?? null,
    afterGap: input.afterGap,
  };
}
