/*
 * Lines out, framed as PROTOCOL.md says: `<body>*<CRC-32 of body, 8 upper-case hex digits>` LF.
 * The main loop is the only writer. It waits for the transmitter between bytes (the USART's data register is the
 * whole transmit buffer), so a line always goes out whole and in order; the interrupts never write here.
 */
#ifndef RW_SERIAL_OUT_H
#define RW_SERIAL_OUT_H
#include <stdint.h>

void serialInit(void);
void lineBegin(void);
void lineChar(char character);
/* A string from flash (PSTR). */
void lineText(const char *flashText);
void lineHex32(uint32_t value);
void lineDecimal(uint32_t value);
/* Base64 (RFC 4648 section 4) of `count` bytes; `count` must be a multiple of 3 (no padding). */
void lineBase64(const uint8_t *bytes, uint16_t count);
void lineEnd(void);

#endif
