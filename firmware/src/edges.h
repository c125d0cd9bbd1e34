/*
 * Timed edges: the sync comparator on INT0 (PD2) and the gate on INT1 (PD3) interrupt on every change and stamp
 * Timer1 (extended to 32 bits). The interrupts fill a ring the main loop empties into edge lines.
 */
#ifndef RW_EDGES_H
#define RW_EDGES_H
#include <stdint.h>

#define EDGE_SYNC 0
#define EDGE_GATE 1

typedef struct {
  uint32_t ticks;
  /* EDGE_SYNC or EDGE_GATE in bit 0, the level after the edge (1 = rising) in bit 1. */
  uint8_t kind;
} TimedEdge;

void edgesInit(void);
/* Empties the ring and the lost count, and starts (or stops) accepting edges. */
void edgesReset(uint8_t accepting);
uint8_t edgesWaiting(void);
/* The i-th waiting edge (0 = oldest); valid until edgesRelease. */
TimedEdge edgesPeek(uint8_t index);
void edgesRelease(uint8_t count);
uint32_t edgesLost(void);

#endif
