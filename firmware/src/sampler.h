/*
 * Hardware-timed sampling into whole blocks. The ADC interrupt fills one block slot at a time; the main loop sends
 * full slots in order. A block is only ever written into a free slot: when every slot still waits to be sent,
 * the block about to start is discarded whole (its sequence number is spent and an overrun is counted, as
 * PROTOCOL.md "Status" says), and a slot being sent is never touched, so no line is ever corrupted.
 */
#ifndef RW_SAMPLER_H
#define RW_SAMPLER_H
#include <stdint.h>
#include "config.h"

/* Reads the ADC once so later conversions take 13 ADC clocks, not the first conversion's 25 (datasheet). */
void samplerInit(void);
/* Starts (or restarts) sampling at `rateHz`: sequence 0, no overruns, edge time zero at the first hold instant. */
void samplerStart(uint32_t rateHz);
void samplerStop(void);
/* True when `rateHz` is a rate this logger can time exactly (see config.h); else the reason is in *why (flash). */
uint8_t samplerRateIsValid(uint32_t rateHz, const char **why);

/* The oldest full block, or null. Its sequence number goes to *sequence. */
const uint8_t *samplerFullBlock(uint32_t *sequence);
/* Gives the oldest full block's slot back to the sampler. */
void samplerReleaseBlock(void);

uint32_t samplerNextSequence(void);
uint32_t samplerOverruns(void);
/* True (once) when the ADC interrupt came too late to set the next trigger: sampling must be restarted. */
uint8_t samplerTakeLateTrigger(void);
/* Timer1 extended to 32 bits at the first sample's hold instant (edge time zero). */
uint32_t samplerTimeZero(void);
/* Timer1's overflow count, the upper 16 bits of the 32-bit time (read in interrupts with TOV1 in mind). */
extern volatile uint16_t timerHigh;

#endif
