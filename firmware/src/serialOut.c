#include <avr/io.h>
#include <avr/pgmspace.h>
#include "config.h"
#include "crc32.h"
#include "serialOut.h"

static uint32_t lineCrc;

static const char base64Alphabet[64] PROGMEM = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
static const char hexDigits[16] PROGMEM = "0123456789ABCDEF";

void serialInit(void) {
  UBRR0 = SERIAL_UBRR;
  UCSR0A = _BV(U2X0);
  UCSR0C = _BV(UCSZ01) | _BV(UCSZ00); /* 8N1 */
  UCSR0B = _BV(RXEN0) | _BV(TXEN0) | _BV(RXCIE0);
}

static inline void sendByte(uint8_t byte) {
  while (!(UCSR0A & _BV(UDRE0))) {
  }
  UDR0 = byte;
}

void lineBegin(void) {
  lineCrc = CRC32_INITIAL;
}

void lineChar(char character) {
  sendByte((uint8_t)character);
  lineCrc = crc32Update(lineCrc, (uint8_t)character);
}

void lineText(const char *flashText) {
  char character;
  while ((character = (char)pgm_read_byte(flashText++)) != 0) lineChar(character);
}

static void hex32(uint32_t value, uint8_t counted) {
  for (int8_t shift = 28; shift >= 0; shift -= 4) {
    char digit = (char)pgm_read_byte(&hexDigits[(uint8_t)(value >> shift) & 0x0F]);
    if (counted) lineChar(digit);
    else sendByte((uint8_t)digit);
  }
}

void lineHex32(uint32_t value) {
  hex32(value, 1);
}

void lineDecimal(uint32_t value) {
  char digits[10];
  uint8_t count = 0;
  do {
    digits[count++] = (char)('0' + value % 10);
    value /= 10;
  } while (value != 0);
  while (count > 0) lineChar(digits[--count]);
}

void lineBase64(const uint8_t *bytes, uint16_t count) {
  for (uint16_t at = 0; at + 2 < count; at += 3) {
    uint8_t a = bytes[at];
    uint8_t b = bytes[at + 1];
    uint8_t c = bytes[at + 2];
    lineChar((char)pgm_read_byte(&base64Alphabet[a >> 2]));
    lineChar((char)pgm_read_byte(&base64Alphabet[((a & 0x03) << 4) | (b >> 4)]));
    lineChar((char)pgm_read_byte(&base64Alphabet[((b & 0x0F) << 2) | (c >> 6)]));
    lineChar((char)pgm_read_byte(&base64Alphabet[c & 0x3F]));
  }
}

void lineEnd(void) {
  sendByte('*');
  hex32(lineCrc ^ CRC32_FINAL_XOR, 0);
  sendByte('\n');
}
