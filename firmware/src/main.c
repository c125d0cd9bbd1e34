/*
 * The Rampwright logger (RWLOG/1, app/logger/PROTOCOL.md) on an ATmega328P at 16 MHz.
 *
 * Interrupts: ADC (one conversion, hardware-triggered by Timer1 compare B), INT0/INT1 (timed edges), Timer1
 * overflow (the upper half of 32-bit time), USART receive (host commands). The main loop does everything else:
 * it answers commands between lines, and sends edge, data and status lines, CRC and base64 computed here.
 * No dynamic allocation; every buffer has a fixed size derived in config.h.
 */
#include <avr/interrupt.h>
#include <avr/io.h>
#include <avr/pgmspace.h>
#include <avr/wdt.h>
#include "commands.h"
#include "config.h"
#include "edges.h"
#include "frontEnd.h"
#include "sampler.h"
#include "serialOut.h"

static uint32_t rateHz = RATE_DEFAULT_HZ;
static uint8_t started;
static uint8_t edgesOn;
static uint16_t blocksUntilStatus;

/* Free SRAM is painted with 0xC5 at reset, before anything uses the stack, so a debugger (or the simulator in the
 * tests) can read how deep the stack ever reached: the lowest address still painted. */
void paintStack(void) __attribute__((naked, used, section(".init1")));
void paintStack(void) {
  __asm__ volatile(
      "ldi r30, lo8(__bss_end)\n\t"
      "ldi r31, hi8(__bss_end)\n\t"
      "ldi r24, lo8(__stack)\n\t"
      "ldi r25, hi8(__stack)\n\t"
      "ldi r18, 0xC5\n\t"
      "1: st Z+, r18\n\t"
      "cp r30, r24\n\t"
      "cpc r31, r25\n\t"
      "brlo 1b\n\t" ::: "r18", "r24", "r25", "r30", "r31", "memory");
}

/* The watchdog is stopped first thing after any reset, before the C start-up code (the datasheet's advice: it stays
 * on after a watchdog reset, and would reset again before main() runs). */
void disableWatchdogAtStart(void) __attribute__((naked, used, section(".init3")));
void disableWatchdogAtStart(void) {
  MCUSR = 0;
  wdt_disable();
}

static void sendGreeting(void) {
  lineBegin();
  lineText(PSTR("H RWLOG/1 id=" LOGGER_ID " rate="));
  lineDecimal(rateHz);
  lineText(PSTR(" bits="));
  lineDecimal(ADC_BITS);
  lineText(PSTR(" block="));
  lineDecimal(BLOCK);
  lineText(PSTR(" ch=" GREETING_ROLES " gain=" GREETING_GAINS " offset=" GREETING_OFFSETS " skew=" GREETING_SKEW " edges=" GREETING_EDGES " clock="));
  lineDecimal(TIMER_HZ);
  lineEnd();
}

static void sendReply(uint8_t accepted, const char *flashWord, const char *ramWord, const char *flashDetail, uint32_t number, uint8_t withNumber) {
  lineBegin();
  lineChar(accepted ? 'A' : 'E');
  lineChar(' ');
  if (flashWord) lineText(flashWord);
  else
    for (const char *at = ramWord; *at; at++) lineChar(*at);
  if (withNumber) {
    lineChar(' ');
    lineDecimal(number);
  }
  if (flashDetail) {
    if (!withNumber) lineChar(' ');
    lineText(flashDetail);
  }
  lineEnd();
}

static uint16_t blocksPerStatus(void) {
  uint16_t blocks = (uint16_t)(rateHz / BLOCK);
  return blocks == 0 ? 1 : blocks;
}

static void startRun(void) {
  samplerStart(rateHz);
  edgesReset(edgesOn);
  started = 1;
  blocksUntilStatus = blocksPerStatus();
}

static void handleCommand(const CommandLine *line) {
  switch (line->command) {
    case COMMAND_START:
      sendReply(1, PSTR("start"), 0, 0, 0, 0);
      startRun();
      sendGreeting();
      break;
    case COMMAND_STOP:
      samplerStop();
      edgesReset(0);
      started = 0;
      sendReply(1, PSTR("stop"), 0, 0, 0, 0);
      break;
    case COMMAND_IDENTIFY:
      sendReply(1, PSTR("identify"), 0, 0, 0, 0);
      sendGreeting();
      break;
    case COMMAND_EDGES_ON:
    case COMMAND_EDGES_OFF:
      edgesOn = line->command == COMMAND_EDGES_ON;
      edgesReset(edgesOn && started);
      sendReply(1, PSTR("edges"), 0, edgesOn ? PSTR("on") : PSTR("off"), 0, 0);
      break;
    case COMMAND_RATE: {
      const char *why = 0;
      if (!samplerRateIsValid(line->rateHz, &why)) {
        /* E rate rate <Hz> <why>: the reason names the rate asked for. */
        sendReply(0, PSTR("rate rate"), 0, why, line->rateHz, 1);
        break;
      }
      rateHz = line->rateHz;
      sendReply(1, PSTR("rate"), 0, 0, rateHz, 1);
      startRun();
      sendGreeting();
      break;
    }
    default:
      sendReply(0, 0, line->word, line->reason, 0, 0);
      break;
  }
}

/* `T <edge> ...`: each edge is S or G, + or -, and 8 hex digits of clock ticks since the first sample's hold instant. */
static void sendEdges(void) {
  uint8_t count = edgesWaiting();
  if (count == 0) return;
  uint32_t zero = samplerTimeZero();
  lineBegin();
  lineChar('T');
  for (uint8_t index = 0; index < count; index++) {
    TimedEdge edge = edgesPeek(index);
    lineChar(' ');
    lineChar((edge.kind & 1) == EDGE_GATE ? 'G' : 'S');
    lineChar((edge.kind & 2) ? '+' : '-');
    lineHex32(edge.ticks - zero);
  }
  lineEnd();
  edgesRelease(count);
}

static void sendStatus(void) {
  lineBegin();
  lineText(PSTR("S "));
  lineHex32(samplerNextSequence());
  lineText(PSTR(" overruns="));
  lineDecimal(samplerOverruns());
  lineText(PSTR(" edgeslost="));
  lineDecimal(edgesLost());
  lineEnd();
}

static void sendData(const uint8_t *block, uint32_t sequence) {
  lineBegin();
  lineText(PSTR("D "));
  lineHex32(sequence);
  lineChar(' ');
  lineBase64(block, BLOCK_BYTES);
  lineEnd();
}

int main(void) {
  serialInit();
  commandsInit();
  samplerInit();
  edgesInit();
  wdt_enable(WDTO_250MS);
  sei();
  sendGreeting();
  startRun();
  for (;;) {
    wdt_reset();
    CommandLine line;
    if (commandsPoll(&line)) {
      handleCommand(&line);
      continue;
    }
    if (!started) continue;
    if (samplerTakeLateTrigger()) {
      /* A trigger was missed (should not happen at the rates allowed): the time base is broken, so the run
         restarts and says so with a greeting; the host sees the sequence start again. */
      startRun();
      sendGreeting();
      continue;
    }
    uint32_t sequence;
    const uint8_t *block = samplerFullBlock(&sequence);
    /* Edges go out before the data line of the block they fell in (PROTOCOL.md "Timed edges"). */
    if (block || edgesWaiting() >= EDGE_CAPACITY / 2) sendEdges();
    if (!block) continue;
    sendData(block, sequence);
    samplerReleaseBlock();
    if (--blocksUntilStatus == 0) {
      blocksUntilStatus = blocksPerStatus();
      sendStatus();
    }
  }
}
