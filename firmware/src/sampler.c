#include <avr/interrupt.h>
#include <avr/io.h>
#include <avr/pgmspace.h>
#include <util/atomic.h>
#include "sampler.h"

/* REFS1:0 = 00: the external reference on AREF. */
#define ADMUX_BASE 0
/* ADTS2:0 = 101: Timer/Counter1 Compare Match B. */
#define ADTS_TIMER1_COMPARE_B (_BV(ADTS2) | _BV(ADTS0))

static uint8_t slots[BLOCK_SLOTS][BLOCK_BYTES];
static uint32_t slotSequence[BLOCK_SLOTS];
/* Full slots waiting to be sent: the ADC interrupt adds, the main loop takes away (with interrupts off). */
static volatile uint8_t fullSlots;
/* Main loop only. */
static uint8_t sendSlot;
/* ADC interrupt only (and samplerStart with interrupts off). */
static uint8_t fillSlot;
/* Where the next code goes in the slot being filled; null while a block is being discarded. */
static uint8_t *fillAt;
/* Conversions left in the current block (CHANNELS x BLOCK = 120 fits a byte). */
static uint8_t conversionsLeft;
static uint16_t triggerTicks;
/* The compare value of the next trigger (OCR1B), kept here so it is never read back from the timer. */
static uint16_t nextTrigger;
static volatile uint32_t nextSequence;
static volatile uint32_t overruns;
static volatile uint8_t lateTrigger;
static uint32_t timeZero;
volatile uint16_t timerHigh;

ISR(TIMER1_OVF_vect) {
  timerHigh++;
}

void samplerInit(void) {
  /* Digital input buffers off on the analog pins (less current, less noise). */
  DIDR0 = _BV(ADC0D) | _BV(ADC1D) | _BV(ADC2D) | _BV(ADC3D);
  ADMUX = ADMUX_BASE;
  ADCSRA = _BV(ADEN) | _BV(ADSC) | ADC_PRESCALER_BITS;
  while (ADCSRA & _BV(ADSC)) {
  }
  ADCSRA = _BV(ADEN) | _BV(ADIF) | ADC_PRESCALER_BITS;
  /* Timer1 free-running (normal mode) at the CPU clock; its overflow extends it to 32 bits. */
  TCCR1A = 0;
  TCCR1B = TIMER_PRESCALER_BITS;
  TIMSK1 = _BV(TOIE1);
}

uint8_t samplerRateIsValid(uint32_t rateHz, const char **why) {
  if (rateHz > RATE_MAX_HZ) {
    *why = PSTR(" Hz is above this logger's 6250 Hz (the serial link's limit with 4 channels)");
    return 0;
  }
  if (rateHz < RATE_MIN_HZ) {
    *why = PSTR(" Hz is below this logger's 1000 Hz");
    return 0;
  }
  if (TIMER_TICKS_PER_CHANNEL_HZ % rateHz != 0) {
    *why = PSTR(" Hz cannot be timed exactly from the 16 MHz clock: choose a rate that divides 4000000, such as 6250, 5000, 4000, 3200, 2500, 2000 or 1000");
    return 0;
  }
  return 1;
}

void samplerStop(void) {
  ATOMIC_BLOCK(ATOMIC_RESTORESTATE) {
    ADCSRA = _BV(ADEN) | _BV(ADIF) | ADC_PRESCALER_BITS;
    ADCSRB = 0;
    TIMSK1 = _BV(TOIE1);
    fullSlots = 0;
  }
}

void samplerStart(uint32_t rateHz) {
  ATOMIC_BLOCK(ATOMIC_RESTORESTATE) {
    ADCSRA = _BV(ADEN) | _BV(ADIF) | ADC_PRESCALER_BITS;
    triggerTicks = (uint16_t)(TIMER_TICKS_PER_CHANNEL_HZ / rateHz);
    fullSlots = 0;
    sendSlot = 0;
    fillSlot = 0;
    fillAt = slots[0];
    conversionsLeft = CHANNELS * BLOCK;
    nextSequence = 0;
    overruns = 0;
    lateTrigger = 0;
    ADMUX = ADMUX_BASE;
    ADCSRB = ADTS_TIMER1_COMPARE_B;
    uint16_t now = TCNT1;
    uint16_t high = timerHigh;
    if ((TIFR1 & _BV(TOV1)) && now < 0x8000) high++;
    uint16_t firstTrigger = now + FIRST_TRIGGER_LEAD_TICKS;
    if (firstTrigger < now) high++;
    timeZero = (((uint32_t)high << 16) | firstTrigger) + SAMPLE_HOLD_TICKS;
    OCR1B = firstTrigger;
    nextTrigger = firstTrigger;
    TIFR1 = _BV(OCF1B);
    TIMSK1 = _BV(TOIE1) | _BV(OCIE1B);
    ADCSRA = _BV(ADEN) | _BV(ADATE) | _BV(ADIE) | _BV(ADIF) | ADC_PRESCALER_BITS;
  }
}

/* A whole block is done: hand its slot to the main loop and take the next free one, or discard the next block. */
static inline void blockDone(void) __attribute__((always_inline));
static inline void blockDone(void) {
  if (fillAt) {
    slotSequence[fillSlot] = nextSequence;
    fullSlots++;
    fillSlot = fillSlot + 1 == BLOCK_SLOTS ? 0 : fillSlot + 1;
  } else {
    overruns++;
  }
  nextSequence++;
  fillAt = fullSlots == BLOCK_SLOTS ? 0 : slots[fillSlot];
  conversionsLeft = CHANNELS * BLOCK;
}

/*
 * A trigger has just started a conversion. Everything the next trigger needs is set here, a whole trigger period
 * ahead of it (the conversion itself takes 27 of the 40 us at the highest rate, so doing it when the conversion
 * ends would leave 13 us, and an edge interrupt or two in between could use them up):
 * - the next compare value. Interrupts are enabled at once (ISR_NOBLOCK) so the edge interrupts wait at most a few
 *   cycles; only the Timer1 register accesses run with interrupts off, because the edge interrupts read TCNT1 and
 *   every 16-bit Timer1 access shares one TEMP register (datasheet, "Accessing 16-bit Registers");
 * - the next channel. ADMUX may change once the running conversion is one ADC clock (32 cycles) old (datasheet,
 *   "Changing Channel or Reference Selection"); the interrupt response and the lines before it take longer.
 * Executing this vector clears OCF1B, so the next compare match is a fresh rising edge that triggers the ADC.
 */
ISR(TIMER1_COMPB_vect, ISR_NOBLOCK) {
  uint16_t trigger = nextTrigger + triggerTicks;
  nextTrigger = trigger;
  cli();
  OCR1B = trigger;
  uint16_t now = TCNT1;
  sei();
  if ((uint16_t)(now - trigger) < 0x8000) lateTrigger = 1;
  /* CHANNELS is 4: the MUX bits wrap by masking. */
  ADMUX = ADMUX_BASE | ((ADMUX + 1) & (CHANNELS - 1));
}

/*
 * One conversion done: its code goes into the slot in conversion order, which is the protocol's interleaved order
 * (PROTOCOL.md "Data"), little-endian as the protocol and the AVR both store 16-bit words. It has until the next
 * conversion ends, a whole trigger period.
 */
ISR(ADC_vect, ISR_NOBLOCK) {
  uint8_t low = ADCL;
  uint8_t high = ADCH;
  uint8_t *at = fillAt;
  if (at) {
    at[0] = low;
    at[1] = high;
    fillAt = at + 2;
  }
  if (--conversionsLeft == 0) blockDone();
}

const uint8_t *samplerFullBlock(uint32_t *sequence) {
  if (fullSlots == 0) return 0;
  *sequence = slotSequence[sendSlot];
  return slots[sendSlot];
}

void samplerReleaseBlock(void) {
  sendSlot = sendSlot + 1 == BLOCK_SLOTS ? 0 : sendSlot + 1;
  ATOMIC_BLOCK(ATOMIC_RESTORESTATE) {
    fullSlots--;
  }
}

uint32_t samplerNextSequence(void) {
  uint32_t value;
  ATOMIC_BLOCK(ATOMIC_RESTORESTATE) {
    value = nextSequence;
  }
  return value;
}

uint32_t samplerOverruns(void) {
  uint32_t value;
  ATOMIC_BLOCK(ATOMIC_RESTORESTATE) {
    value = overruns;
  }
  return value;
}

uint8_t samplerTakeLateTrigger(void) {
  uint8_t late = lateTrigger;
  lateTrigger = 0;
  return late;
}

uint32_t samplerTimeZero(void) {
  return timeZero;
}
