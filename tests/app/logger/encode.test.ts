import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { encodeCommand, encodeReply, encodeStatus, parseCommand, parseReplyBody, parseStatusBody } from '../../../app/logger/encode';
import { frameLine, unframeLine } from '../../../app/logger/frame';
import type { HostCommand } from '../../../app/logger/protocol';

describe('host commands and logger replies', () => {
  it('every host command survives encode then parse', () => {
    const command = fc.oneof(
      fc.constantFrom<HostCommand>({ command: 'start' }, { command: 'stop' }, { command: 'identify' }),
      fc.integer({ min: 1, max: 999_999_999 }).map((sampleRateHz): HostCommand => ({ command: 'rate', sampleRateHz })),
    );
    fc.assert(
      fc.property(command, (sent) => {
        expect(parseCommand(encodeCommand(sent))).toEqual({ ok: true, command: sent });
        expect(parseCommand(`${encodeCommand(sent)}\r`)).toEqual({ ok: true, command: sent });
      }),
    );
  });

  it('refuses a command with a bad CRC, an unknown word or a bad rate, with a reply a technician can read', () => {
    const damaged = encodeCommand({ command: 'start' }).replace('start', 'stArt');
    expect(parseCommand(damaged)).toEqual({ ok: false, reply: { ok: false, command: '?', detail: 'command failed its CRC check' } });
    expect(parseCommand('start')).toMatchObject({ ok: false, reply: { detail: 'command has no *CRC' } });
    expect(parseCommand(frameLine('reboot'))).toMatchObject({ ok: false, reply: { command: 'reboot', detail: expect.stringMatching(/unknown command/) } });
    expect(parseCommand(frameLine('rate fast'))).toMatchObject({ ok: false, reply: { command: 'rate' } });
    expect(parseCommand(frameLine('rate 0'))).toMatchObject({ ok: false, reply: { command: 'rate' } });
  });

  it('never throws on any text given as a command', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 100 }), (text) => {
        const result = parseCommand(text);
        expect(typeof result.ok).toBe('boolean');
      }),
    );
  });

  it('status and replies survive encode then parse; a reply may hold * in its text', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 0xffffffff }), fc.integer({ min: 0, max: 2 ** 31 }), (nextSequence, overruns) => {
        const line = encodeStatus({ nextSequence, overruns });
        const frame = unframeLine(line);
        expect(frame.ok).toBe(true);
        if (frame.ok) expect(parseStatusBody(line.slice(0, frame.bodyEnd))).toEqual({ nextSequence, overruns });
      }),
    );
    const line = encodeReply({ ok: false, command: 'rate', detail: 'allowed rates are 1000*k Hz' });
    const frame = unframeLine(line);
    expect(frame.ok).toBe(true);
    if (frame.ok) expect(parseReplyBody(line.slice(0, frame.bodyEnd))).toEqual({ ok: false, command: 'rate', detail: 'allowed rates are 1000*k Hz' });
  });
});
