/*
 * The analog front end as the greeting states it (PROTOCOL.md: volts at the test point = offset + gain x code).
 * firmware/README.md derives these numbers from the resistor values; tests/main/firmware checks that the two agree.
 *
 * Reference: an external 4.096 V reference on AREF (REFS1:0 = 00), one code = 4.096 V / 1024 = 4 mV at the pin.
 * A code c stands for pin voltages from c to c + 1 codes (the converter truncates), so its middle is (c + 0.5) codes.
 *
 * sync (ADC0): 100k from the test point, 20k5 to the reference, 25k5 to ground: the pin sees
 *   k = 0.1020448 of the test point plus 2.038905 V; gain = 4 mV / k, offset = (2 mV - 2.038905 V) / k.
 * gate, ramp, control (ADC1..ADC3): 52k3 over 10k: k = 10 / 62.3 = 0.1605136; gain = 4 mV / k, offset = 2 mV / k.
 */
#ifndef RW_FRONT_END_H
#define RW_FRONT_END_H

#define GREETING_ROLES "sync,gate,ramp,control"
#define GREETING_GAINS "0.03919847,0.02492,0.02492,0.02492"
#define GREETING_OFFSETS "-19.96089,0.01246,0.01246,0.01246"
/* One trigger converts one channel, in ch= order, a quarter of the sample period apart (config.h, "Sampling"):
 * each channel's sampling instant after the frame's, as a fraction of the sample period. */
#define GREETING_SKEW "0,0.25,0.5,0.75"
#define GREETING_EDGES "sync,gate"
#define ADC_BITS 10

#endif
