/**
 * CRC-32/ISO-HDLC (the CRC of zlib, PNG and Ethernet): reflected polynomial 0x04C11DB7 (0xEDB88320 reflected),
 * initial value 0xFFFFFFFF, final XOR 0xFFFFFFFF. Check value for the ASCII string "123456789": 0xCBF43926
 * (CRC RevEng catalogue). Chosen over a 16-bit CRC because a data line is about a kilobyte and a garbled line
 * that still looks like a frame must pass unnoticed far less often than once in 65 536 (see PROTOCOL.md).
 */
const table = buildTable();

function buildTable(): Uint32Array {
  const entries = new Uint32Array(256);
  for (let index = 0; index < 256; index++) {
    let value = index;
    for (let bit = 0; bit < 8; bit++) value = value & 1 ? (value >>> 1) ^ 0xedb88320 : value >>> 1;
    entries[index] = value >>> 0;
  }
  return entries;
}

/** CRC-32/ISO-HDLC of bytes. */
export function crc32(bytes: Uint8Array): number {
  let crc = 0xffffffff;
  for (let index = 0; index < bytes.length; index++) crc = table[(crc ^ bytes[index]) & 0xff] ^ (crc >>> 8);
  return (crc ^ 0xffffffff) >>> 0;
}

/**
 * CRC-32/ISO-HDLC of the characters `text[start..end)` taken as bytes (the protocol is ASCII; a character above
 * 0xFF cannot match any byte the logger sent, so its low byte is used and the check simply fails).
 */
export function crc32OfText(text: string, start = 0, end = text.length): number {
  let crc = 0xffffffff;
  for (let index = start; index < end; index++) crc = table[(crc ^ text.charCodeAt(index)) & 0xff] ^ (crc >>> 8);
  return (crc ^ 0xffffffff) >>> 0;
}

/** The 8 upper-case hexadecimal digits the protocol writes after `*`. */
export function crcToHex(crc: number): string {
  return (crc >>> 0).toString(16).toUpperCase().padStart(8, '0');
}
