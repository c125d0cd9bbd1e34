/*
 * Host commands in: the receive interrupt puts bytes in a ring, the main loop assembles lines and reads them.
 * A command is `<word>[ <argument>]*<CRC>` (PROTOCOL.md "Host to logger").
 */
#ifndef RW_COMMANDS_H
#define RW_COMMANDS_H
#include <stdint.h>

#define COMMAND_NONE 0
#define COMMAND_START 1
#define COMMAND_STOP 2
#define COMMAND_RATE 3
#define COMMAND_IDENTIFY 4
#define COMMAND_EDGES_ON 5
#define COMMAND_EDGES_OFF 6
/* A line that is not a command: the E reply's word and reason are in the result. */
#define COMMAND_REFUSED 7

typedef struct {
  uint8_t command;
  uint32_t rateHz;
  /* For COMMAND_REFUSED: the command word answered (RAM, "?" when unreadable) and the reason (flash). */
  const char *word;
  const char *reason;
} CommandLine;

void commandsInit(void);
/* Takes the bytes received so far; returns 1 when they complete a line, described in *line. */
uint8_t commandsPoll(CommandLine *line);

#endif
