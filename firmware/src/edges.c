#include <avr/interrupt.h>
#include <avr/io.h>
#include <util/atomic.h>
#include "config.h"
#include "edges.h"
#include "sampler.h"

static TimedEdge ring[EDGE_CAPACITY];
/* The interrupts write at `head`, the main loop reads at `tail`; `waiting` counts what lies between. */
static uint8_t head;
static uint8_t tail;
static volatile uint8_t waiting;
static volatile uint32_t lost;
static volatile uint8_t accepting;

void edgesInit(void) {
  DDRD &= (uint8_t) ~(_BV(PD2) | _BV(PD3));
  /* ISC01:00 = 01 and ISC11:10 = 01: any logical change. */
  EICRA = _BV(ISC00) | _BV(ISC10);
  EIFR = _BV(INTF0) | _BV(INTF1);
  EIMSK = _BV(INT0) | _BV(INT1);
}

void edgesReset(uint8_t accept) {
  ATOMIC_BLOCK(ATOMIC_RESTORESTATE) {
    head = 0;
    tail = 0;
    waiting = 0;
    lost = 0;
    accepting = accept;
  }
}

/*
 * The 32-bit time of a TCNT1 value read in an interrupt: an overflow whose interrupt has not run yet (TOV1 still
 * set) belongs before this reading when the count has just wrapped (small value), after it otherwise.
 */
static inline uint32_t extendedTicks(uint16_t count) {
  uint16_t high = timerHigh;
  if ((TIFR1 & _BV(TOV1)) && count < 0x8000) high++;
  return ((uint32_t)high << 16) | count;
}

static inline void record(uint16_t count, uint8_t kind) {
  if (!accepting) return;
  if (waiting == EDGE_CAPACITY) {
    lost++;
    return;
  }
  ring[head].ticks = extendedTicks(count) - EDGE_LATENCY_TICKS;
  ring[head].kind = kind;
  head = head + 1 == EDGE_CAPACITY ? 0 : head + 1;
  waiting++;
}

/*
 * Each edge interrupt starts with a few instructions of its own (no prologue) that read TCNT1 at once: 4 cycles of
 * interrupt response, 3 of the vector's jmp, 2 of a push and 2 of the read, so the count lags the pin change by a
 * fixed 11 cycles plus the rest of the instruction that was running (EDGE_LATENCY_TICKS). None of these touch
 * SREG. The C body then files the edge, and its reti ends the interrupt.
 */
/* The bodies are interrupt handlers reached by jmp from the vectors, not vectors themselves. */
#pragma GCC diagnostic ignored "-Wmisspelled-isr"
static volatile uint16_t syncCount;
static volatile uint16_t gateCount;
void syncEdgeBody(void) __attribute__((signal, used, externally_visible));
void gateEdgeBody(void) __attribute__((signal, used, externally_visible));

ISR(INT0_vect, ISR_NAKED) {
  __asm__ volatile(
      "push r24\n\t"
      "lds r24, %[low]\n\t"
      "sts syncCount, r24\n\t"
      "lds r24, %[high]\n\t"
      "sts syncCount+1, r24\n\t"
      "pop r24\n\t"
      "jmp syncEdgeBody\n\t" ::[low] "i"(_SFR_MEM_ADDR(TCNT1L)),
      [high] "i"(_SFR_MEM_ADDR(TCNT1H)));
}

ISR(INT1_vect, ISR_NAKED) {
  __asm__ volatile(
      "push r24\n\t"
      "lds r24, %[low]\n\t"
      "sts gateCount, r24\n\t"
      "lds r24, %[high]\n\t"
      "sts gateCount+1, r24\n\t"
      "pop r24\n\t"
      "jmp gateEdgeBody\n\t" ::[low] "i"(_SFR_MEM_ADDR(TCNT1L)),
      [high] "i"(_SFR_MEM_ADDR(TCNT1H)));
}

void syncEdgeBody(void) {
  record(syncCount, EDGE_SYNC | ((PIND & _BV(PD2)) ? 2 : 0));
}

void gateEdgeBody(void) {
  record(gateCount, EDGE_GATE | ((PIND & _BV(PD3)) ? 2 : 0));
}

uint8_t edgesWaiting(void) {
  return waiting;
}

TimedEdge edgesPeek(uint8_t index) {
  uint8_t at = tail + index;
  if (at >= EDGE_CAPACITY) at -= EDGE_CAPACITY;
  /* The interrupts never write the entries between tail and tail + waiting: no need to stop them. */
  return ring[at];
}

void edgesRelease(uint8_t count) {
  tail = (uint8_t)((tail + count) % EDGE_CAPACITY);
  ATOMIC_BLOCK(ATOMIC_RESTORESTATE) {
    waiting -= count;
  }
}

uint32_t edgesLost(void) {
  uint32_t value;
  ATOMIC_BLOCK(ATOMIC_RESTORESTATE) {
    value = lost;
  }
  return value;
}
