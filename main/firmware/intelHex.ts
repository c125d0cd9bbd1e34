/**
 * Intel HEX, the image format avr-objcopy writes and avrdude reads: lines `:LLAAAATT<data>CC`, LL data bytes at
 * address AAAA, record type TT (00 data, 01 end of file, 02 extended segment address, 04 extended linear address),
 * CC the two's complement of the byte sum. Checked record by record; a fault names the line.
 */
import { InputError } from '../../app/errors';

/** The program bytes of `text`, for a flash of `flashBytes`. */
export function parseIntelHex(text: string, flashBytes: number, where = 'firmware image'): Uint8Array {
  const flash = new Uint8Array(flashBytes);
  let base = 0;
  let ended = false;
  let dataBytes = 0;
  const lines = text.split(/\r?\n/);
  for (let index = 0; index < lines.length && !ended; index++) {
    const line = lines[index].trim();
    if (line.length === 0) continue;
    const at = `${where}, line ${index + 1}`;
    if (!/^:([0-9A-Fa-f]{2}){5,}$/.test(line)) throw new InputError('is not an Intel HEX record (":" and pairs of hex digits); give the .hex file avr-objcopy writes', at);
    const bytes = Uint8Array.from(line.slice(1).match(/../g) ?? [], (pair) => parseInt(pair, 16));
    const length = bytes[0];
    if (bytes.length !== length + 5) throw new InputError(`says ${length} data bytes but holds ${bytes.length - 5}`, at);
    const sum = bytes.reduce((total, byte) => (total + byte) & 0xff, 0);
    if (sum !== 0) throw new InputError('fails its checksum (the file is damaged)', at);
    const address = (bytes[1] << 8) | bytes[2];
    const type = bytes[3];
    const data = bytes.subarray(4, 4 + length);
    if (type === 0) {
      const start = base + address;
      if (start + length > flashBytes) throw new InputError(`writes past the end of the ${flashBytes}-byte flash (at 0x${start.toString(16)})`, at);
      flash.set(data, start);
      dataBytes += length;
    } else if (type === 1) {
      ended = true;
    } else if (type === 2 && length === 2) {
      base = ((data[0] << 8) | data[1]) * 16;
    } else if (type === 4 && length === 2) {
      base = ((data[0] << 8) | data[1]) * 65536;
    } else if (type !== 3 && type !== 5) {
      throw new InputError(`has record type ${type}, which Intel HEX does not define`, at);
    }
  }
  if (!ended) throw new InputError('has no end-of-file record (":00000001FF"): the file is cut short', where);
  if (dataBytes === 0) throw new InputError('holds no program bytes', where);
  return flash;
}
