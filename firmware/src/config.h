/*
 * The logger's fixed choices, each with the arithmetic behind it. Everything the protocol lets a logger choose is
 * set here; PROTOCOL.md (app/logger) is the reference for the lines themselves.
 *
 * Chip: ATmega328P at 16 MHz (the common 8-bit development boards with a USB-serial bridge).
 */
#ifndef RW_CONFIG_H
#define RW_CONFIG_H

#include <stdint.h>

#ifndef F_CPU
#define F_CPU 16000000UL
#endif

/* The logger's id in the greeting (PROTOCOL.md: 1-32 of A-Z a-z 0-9 . - _). Set per unit: make LOGGER_ID=... */
#ifndef LOGGER_ID
#define LOGGER_ID "RW328-01"
#endif

/* ---- Serial link ----------------------------------------------------------------------------------------------
 * USART0 with U2X: baud = F_CPU / (8 (UBRR + 1)); UBRR 1 gives exactly 1 000 000 baud (datasheet baud formula).
 * 8N1 costs 10 bit times per byte, so the link carries 100 000 bytes per second. */
#define SERIAL_BAUD 1000000UL
#define SERIAL_UBRR ((F_CPU / (8UL * SERIAL_BAUD)) - 1UL)
#define SERIAL_BYTES_PER_S (SERIAL_BAUD / 10UL)

/* ---- Channels -------------------------------------------------------------------------------------------------
 * Four analog inputs, scanned in this order (ADC0..ADC3); the greeting's ch= lists them in the same order.
 * Gate comes right after sync so the scan skew between the two (one conversion slot, a quarter of a sample
 * period) is the smallest. */
#define CHANNELS 4
#if CHANNELS != 4
#error "the ADC interrupt steps the multiplexer by masking with CHANNELS - 1 (sampler.c)"
#endif

/* ---- Data lines -----------------------------------------------------------------------------------------------
 * A data line is "D " + 8 hex + " " + base64(CHANNELS x BLOCK x 2 bytes) + "*" + 8 hex + LF.
 * Line cap (PROTOCOL.md): 4096 characters, so CHANNELS x BLOCK x 8 / 3 <= 4096 - 21, BLOCK <= 382.
 * SRAM sets the real limit: BLOCK_SLOTS blocks of CHANNELS x BLOCK x 2 bytes must fit beside the stack, the
 * command and edge buffers, under 1.5 KiB in all. Three slots (one being filled, one being sent, one spare that
 * absorbs a greeting, a status, an edge or a reply line sent between data lines) of 240 bytes = 720 bytes:
 * BLOCK = 720 / (3 x 4 x 2) = 30 samples per channel. 4 x 30 x 2 = 240 bytes is a multiple of 3, so the base64
 * has no padding: 320 characters, and a data line is 341 bytes with its LF. */
#define BLOCK 30
#define BLOCK_SLOTS 3
#define BLOCK_BYTES (CHANNELS * BLOCK * 2)
#define DATA_LINE_BYTES (2 + 8 + 1 + (BLOCK_BYTES / 3) * 4 + 1 + 8 + 1)
#if (BLOCK_BYTES % 3) != 0
#error "CHANNELS x BLOCK x 2 must be a multiple of 3 so the base64 needs no padding (PROTOCOL.md)"
#endif
#if DATA_LINE_BYTES > 4097
#error "a data line must stay under the protocol's 4096-character cap"
#endif

/* ---- Sampling -------------------------------------------------------------------------------------------------
 * Timer1 runs free at F_CPU (62.5 ns per tick) and is the one time base of samples and edges. Its compare unit B
 * auto-triggers each ADC conversion (ADTS = Timer/Counter1 Compare Match B): the hardware, not software, sets every
 * sampling instant. One trigger converts one channel, so a sample period per channel is CHANNELS trigger periods,
 * and the trigger period in ticks is TIMER_HZ / (CHANNELS x rate) = 4 000 000 / rate: a rate must divide
 * 4 000 000 so the period is a whole number of ticks and the rate in the greeting is exact.
 *
 * Highest rate per channel, the smallest of three limits:
 * - ADC: clock F_CPU / 32 = 500 kHz; an auto-triggered conversion takes 13.5 ADC clocks = 27 us (datasheet), so
 *   at most 37 037 conversions per second, 9 259 samples per second per channel;
 * - serial link: a data line carries 30 frames of 4 samples in 341 bytes, 11.37 bytes per frame; with 10 % of
 *   the link kept for edge lines (about 900 timed edges per second) and 50 bytes/s for status lines,
 *   (100 000 - 10 000 - 50) / 11.37 = 7 913 samples per second per channel;
 * - timer: the rate must divide 4 000 000 (4 000 000 = 2^8 x 5^6); the largest divisor at or below 7 913 is
 *   6 400, the next 6 250. We take 6 250 (a trigger every 640 ticks, 40 us: a round 160 us sample period).
 * Each trigger's compare interrupt sets up the next one, a whole 40 us ahead (sampler.c), and each conversion's
 * result has until the next conversion ends to be stored, so neither waits on the 13 us a conversion leaves free.
 * So RATE_MAX_HZ = 6 250. The CPU load at that rate is measured in the simulator (the tests print it). */
#define TIMER_HZ F_CPU
#define TIMER_PRESCALER_BITS 1 /* CS12:0 = 001, clock / 1 */
#define TIMER_TICKS_PER_CHANNEL_HZ (TIMER_HZ / CHANNELS)
#define RATE_MAX_HZ 6250UL
#define RATE_MIN_HZ 1000UL
#define RATE_DEFAULT_HZ 6250UL
/* ADC clock prescaler 32 (ADPS2:0 = 101): 500 kHz. */
#define ADC_PRESCALER_BITS 5
/* In auto-trigger mode the sample-and-hold happens 2 ADC clocks after the trigger (datasheet): 64 CPU cycles.
 * The first sample's hold instant is the zero of edge time. */
#define SAMPLE_HOLD_TICKS 64
/* First trigger this long after start, so the set-up is done before it (ticks, 100 us). */
#define FIRST_TRIGGER_LEAD_TICKS 1600

/* ---- Timed edges ----------------------------------------------------------------------------------------------
 * INT0 (PD2) sees the sync zero-crossing comparator, INT1 (PD3) the gate level; both interrupt on any change and
 * stamp Timer1. EDGE_LATENCY_TICKS is the time from the pin change to the read of TCNT1 in the interrupt, in
 * ticks of one CPU cycle: 4 cycles of interrupt response (datasheet), 3 for the vector's jmp, 2 for a push and 2
 * for the read itself (edges.c, and avr-objdump -d of the build), plus one for the instruction that was running
 * when the pin changed (it finishes first; 1 to 4 cycles, most take 1 or 2).
 * EDGE_CAPACITY: a full edge queue is one edge line of 1 + 32 x 11 + 10 = 363 bytes, far under the line cap; it
 * holds 32 edges, at least 3 data lines' worth on a 60 Hz full-wave board (about 360 edges per second: 1.7 per
 * 30-sample block at 6 250 samples/s, 10.8 at 1 000 samples/s). A full queue drops new edges and counts them
 * (status line: edgeslost=). */
#define EDGE_LATENCY_TICKS 12
#define EDGE_CAPACITY 32

/* ---- Commands -------------------------------------------------------------------------------------------------
 * The longest command is "rate 123456789*XXXXXXXX" (23 characters); COMMAND_MAX holds it with room. A longer line
 * is refused whole. COMMAND_RING holds two such commands sent back to back while a data line is going out. */
#define COMMAND_MAX 32
#define COMMAND_RING 64

/* Watchdog: 250 ms (main.c). The main loop's longest step is one line of at most 363 bytes, 3.6 ms at
 * 100 000 bytes/s, so only a hung loop lets it expire; the logger then restarts and greets. */

#endif
