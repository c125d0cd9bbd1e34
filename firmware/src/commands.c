#include <avr/interrupt.h>
#include <avr/io.h>
#include <avr/pgmspace.h>
#include <string.h>
#include <util/atomic.h>
#include "commands.h"
#include "config.h"
#include "crc32.h"

static volatile uint8_t ring[COMMAND_RING];
static volatile uint8_t ringHead;
static uint8_t ringTail;

static char text[COMMAND_MAX + 1];
static uint8_t length;
static uint8_t tooLong;

/* The byte is taken first: reading UDR0 clears the interrupt. A full ring drops bytes; the line then fails its CRC. */
ISR(USART_RX_vect) {
  uint8_t byte = UDR0;
  uint8_t next = ringHead + 1 == COMMAND_RING ? 0 : ringHead + 1;
  if (next == ringTail) {
    return;
  }
  ring[ringHead] = byte;
  ringHead = next;
}

void commandsInit(void) {
  ringHead = 0;
  ringTail = 0;
  length = 0;
  tooLong = 0;
}

static int8_t hexValue(char character) {
  if (character >= '0' && character <= '9') return (int8_t)(character - '0');
  if (character >= 'A' && character <= 'F') return (int8_t)(character - 'A' + 10);
  if (character >= 'a' && character <= 'f') return (int8_t)(character - 'a' + 10);
  return -1;
}

static uint8_t refuse(CommandLine *line, const char *word, const char *reason) {
  line->command = COMMAND_REFUSED;
  line->word = word;
  line->reason = reason;
  return 1;
}

/* The line in `text` (terminator and CR removed): frame check, then the command word and its argument. */
static uint8_t readLine(CommandLine *line) {
  static char question[] = "?";
  if (tooLong) return refuse(line, question, PSTR("command longer than 31 characters"));
  if (length < 10 || text[length - 9] != '*') return refuse(line, question, PSTR("command has no *CRC"));
  uint8_t bodyLength = length - 9;
  uint32_t sent = 0;
  for (uint8_t at = bodyLength + 1; at < length; at++) {
    int8_t digit = hexValue(text[at]);
    if (digit < 0) return refuse(line, question, PSTR("command has no *CRC"));
    sent = (sent << 4) | (uint8_t)digit;
  }
  uint32_t crc = CRC32_INITIAL;
  for (uint8_t at = 0; at < bodyLength; at++) crc = crc32Update(crc, (uint8_t)text[at]);
  if ((crc ^ CRC32_FINAL_XOR) != sent) return refuse(line, question, PSTR("command failed its CRC check"));
  text[bodyLength] = 0;
  char *argument = strchr(text, ' ');
  if (argument) *argument++ = 0;
  if (strcmp_P(text, PSTR("start")) == 0 && !argument) line->command = COMMAND_START;
  else if (strcmp_P(text, PSTR("stop")) == 0 && !argument) line->command = COMMAND_STOP;
  else if (strcmp_P(text, PSTR("identify")) == 0 && !argument) line->command = COMMAND_IDENTIFY;
  else if (strcmp_P(text, PSTR("edges")) == 0 && argument && strcmp_P(argument, PSTR("on")) == 0) line->command = COMMAND_EDGES_ON;
  else if (strcmp_P(text, PSTR("edges")) == 0 && argument && strcmp_P(argument, PSTR("off")) == 0) line->command = COMMAND_EDGES_OFF;
  else if (strcmp_P(text, PSTR("edges")) == 0) return refuse(line, text, PSTR("edges needs on or off"));
  else if (strcmp_P(text, PSTR("rate")) == 0) {
    uint32_t rate = 0;
    uint8_t digits = 0;
    for (char *at = argument; at && *at; at++, digits++) {
      if (*at < '0' || *at > '9' || digits == 9) return refuse(line, text, PSTR("rate needs one whole number of samples per second"));
      rate = rate * 10 + (uint8_t)(*at - '0');
    }
    if (digits == 0 || rate == 0) return refuse(line, text, PSTR("rate needs one whole number of samples per second"));
    line->command = COMMAND_RATE;
    line->rateHz = rate;
  } else {
    /* The word answered must be readable: lower-case letters only, else "?". */
    for (char *at = text; *at; at++) {
      if (*at < 'a' || *at > 'z') return refuse(line, question, PSTR("unknown command (start, stop, rate <Hz>, identify, edges on|off)"));
    }
    return refuse(line, text, PSTR("unknown command (start, stop, rate <Hz>, identify, edges on|off)"));
  }
  return 1;
}

uint8_t commandsPoll(CommandLine *line) {
  while (ringTail != ringHead) {
    uint8_t byte = ring[ringTail];
    ringTail = ringTail + 1 == COMMAND_RING ? 0 : ringTail + 1;
    if (byte == '\n') {
      if (length > 0 && text[length - 1] == '\r') length--;
      uint8_t found = 0;
      if (length > 0 || tooLong) found = readLine(line);
      length = 0;
      tooLong = 0;
      if (found) return 1;
      continue;
    }
    if (length == COMMAND_MAX) tooLong = 1;
    else text[length++] = (char)byte;
  }
  return 0;
}
