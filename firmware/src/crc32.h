/* CRC-32/ISO-HDLC, one byte at a time: start from CRC32_INITIAL, finish by XOR with CRC32_FINAL_XOR. */
#ifndef RW_CRC32_H
#define RW_CRC32_H
#include <stdint.h>

#define CRC32_INITIAL 0xFFFFFFFFUL
#define CRC32_FINAL_XOR 0xFFFFFFFFUL

uint32_t crc32Update(uint32_t crc, uint8_t byte);

#endif
