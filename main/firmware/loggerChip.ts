/**
 * The logger's chip, instruction by instruction: an ATmega328P at 16 MHz in avr8js (npm), running the firmware
 * image with the peripherals the firmware uses: Timer1, the ADC, USART0, port D (INT0/INT1), the watchdog.
 *
 * avr8js models the timer, the external interrupts, the USART and the watchdog from the datasheet, but not the
 * ADC's auto-trigger (ADATE, ADTS): there a conversion only starts when software sets ADSC. This file adds it as
 * the datasheet describes, for the one trigger source the firmware uses: the rising edge of Timer1's compare B
 * flag starts a conversion of the channel ADMUX selects at that moment, the sample-and-hold takes the input two
 * ADC clocks later, and the result is ready 13.5 ADC clocks after the trigger (ATmega328P datasheet, "Analog-to-
 * Digital Converter": auto-triggered conversion timing). A trigger during a conversion is ignored, as on the chip.
 *
 * Two interrupt flags are also corrected to the datasheet's rule that writing a one clears a flag and writing a
 * zero leaves it alone: avr8js 0.21 stores the written byte into TIFR1 (so clearing OCF1B also clears TOV1) and
 * into ADCSRA (so writing ADIF to clear it sets it, and with ADIE raises an interrupt no conversion made).
 * And the transmitter gets the buffer the chip has: UDR0 is a second byte ahead of the shift register, so UDRE0 is
 * set again as soon as a byte moves on into the shift register, a character time before it has gone out
 * (datasheet, "USART: Sending Frames"). avr8js 0.21 sets UDRE0 only when the byte is out, so every cycle an
 * interrupt takes between two bytes would show as a gap on the line that the chip does not have.
 */
import { AVRADC, AVRClock, AVRIOPort, AVRTimer, AVRUSART, AVRWatchdog, CPU, adcConfig, avrInstruction, portBConfig, portCConfig, portDConfig, timer1Config, usart0Config, watchdogConfig } from 'avr8js';

export const chipClockHz = 16_000_000;
export const flashBytes = 32 * 1024;
export const sramBytes = 2048;
/** First SRAM address (after the 32 registers, 64 I/O and 160 extended I/O registers). */
export const sramStart = 0x100;
/** Byte the firmware paints free SRAM with at reset, so the deepest stack reach can be read afterwards. */
export const stackPaint = 0xc5;

const adcsra = adcConfig.ADCSRA;
const adcsrb = adcConfig.ADCSRB;
const admux = adcConfig.ADMUX;
const tifr1 = timer1Config.TIFR;
const ocr1b = timer1Config.OCRB;
const ADEN = 0x80;
const ADATE = 0x20;
const ADIF = 0x10;
const OCF1B = 0x04;
/** ADTS2:0 = 101, Timer/Counter1 Compare Match B. */
const triggerTimer1CompareB = 5;
const holdAdcClocks = 2;
const conversionAdcClocks = 13.5;

export interface LoggerChip {
  readonly cpu: CPU;
  /** Runs the chip up to `cycle` (CPU clock cycles since reset). */
  runUntil(cycle: number): void;
  /** Where the ADC's sample-and-hold reads: volts at pin ADC`channel` at `cycle`. */
  setAnalogInput(read: (channel: number, cycle: number) => number): void;
  /** Drives port D pin `pin` (2 = INT0, 3 = INT1) to `high` at `cycle` (not before the current cycle). */
  schedulePortD(pin: number, high: boolean, cycle: number): void;
  /** Bytes the chip sent since the last call, as text (latin1). */
  takeOutput(): string;
  /** Queues bytes for the chip's receiver; they arrive one character time apart. */
  receive(text: string): void;
  /** The reference on AREF (V). */
  readonly referenceV: number;
  /** SRAM bytes below the stack that the stack never reached, given the static data size (avr-size "Data"). */
  untouchedSramBytes(staticDataBytes: number): number;
  /** Called at each timer-triggered conversion's sample-and-hold instant (chip cycle, ADC channel). */
  onSampleHold: ((cycle: number, channel: number) => void) | null;
}

export function createLoggerChip(image: Uint8Array, options: { referenceV?: number } = {}): LoggerChip {
  const program = new Uint16Array(flashBytes / 2);
  new Uint8Array(program.buffer).set(image.subarray(0, flashBytes));
  const cpu = new CPU(program, sramBytes);
  const clock = new AVRClock(cpu, chipClockHz);
  const timer1 = new AVRTimer(cpu, timer1Config);
  const adc = new AVRADC(cpu, adcConfig);
  const referenceV = options.referenceV ?? 4.096;
  adc.aref = referenceV;
  const usart = new AVRUSART(cpu, usart0Config, chipClockHz);
  new AVRIOPort(cpu, portBConfig);
  new AVRIOPort(cpu, portCConfig);
  const portD = new AVRIOPort(cpu, portDConfig);
  new AVRWatchdog(cpu, watchdogConfig, clock);

  let readAnalog: (channel: number, cycle: number) => number = () => 0;
  let converting = false;

  function prescaler(): number {
    const bits = cpu.data[adcsra] & 7;
    return bits <= 1 ? 2 : 1 << bits;
  }

  function autoTrigger(): void {
    if (converting) return;
    const control = cpu.data[adcsra];
    if (!(control & ADEN) || !(control & ADATE) || (cpu.data[adcsrb] & 7) !== triggerTimer1CompareB) return;
    // The compare matched when the counter passed OCR1B; at one tick per cycle that is this many cycles ago.
    const compare = cpu.data[ocr1b] | (cpu.data[ocr1b + 1] << 8);
    const matchCycle = cpu.cycles - ((timer1.debugTCNT - compare) & 0xffff);
    const channel = cpu.data[admux] & 0x0f;
    const adcClock = prescaler();
    converting = true;
    let code = 0;
    const holdCycle = matchCycle + holdAdcClocks * adcClock;
    cpu.addClockEvent(() => {
      chip.onSampleHold?.(holdCycle, channel);
      const volts = channel < 8 ? readAnalog(channel, holdCycle) : 0;
      code = Math.min(1023, Math.max(0, Math.floor((volts / referenceV) * 1024)));
    }, holdCycle - cpu.cycles);
    cpu.addClockEvent(() => {
      converting = false;
      adc.completeADCRead(code);
    }, matchCycle + Math.ceil(conversionAdcClocks * adcClock) - cpu.cycles);
  }

  const timerFlagsWrite = cpu.writeHooks[tifr1];
  cpu.writeHooks[tifr1] = (value, old, address, mask) => {
    const handled = timerFlagsWrite(value, old, address, mask);
    cpu.data[tifr1] = old & ~value;
    return handled;
  };
  const adcControlWrite = cpu.writeHooks[adcsra];
  const adcInterrupt = { address: adcConfig.adcInterrupt, flagRegister: adcsra, flagMask: ADIF, enableRegister: adcsra, enableMask: 0x08 };
  cpu.writeHooks[adcsra] = (value, old, address, mask) => {
    if (value & ADIF) cpu.clearInterrupt(adcInterrupt, true);
    return adcControlWrite((value & ~ADIF) | (value & ADIF ? 0 : old & ADIF), old, address, mask);
  };

  const setFlag = cpu.setInterruptFlag.bind(cpu);
  cpu.setInterruptFlag = (interrupt) => {
    const rising = interrupt.flagRegister === tifr1 && interrupt.flagMask === OCF1B && !(cpu.data[tifr1] & OCF1B);
    setFlag(interrupt);
    if (rising) autoTrigger();
  };

  const output: number[] = [];
  transmitWithBuffer(cpu, (byte) => output.push(byte));
  const incoming: number[] = [];
  const pump = (): void => {
    if (incoming.length > 0 && !usart.rxBusy && usart.writeByte(incoming[0])) incoming.shift();
  };
  usart.onRxComplete = pump;

  const chip: LoggerChip = {
    cpu,
    referenceV,
    onSampleHold: null,
    runUntil(cycle) {
      pump();
      while (cpu.cycles < cycle) {
        avrInstruction(cpu);
        cpu.tick();
      }
    },
    setAnalogInput(read) {
      readAnalog = read;
    },
    schedulePortD(pin, high, cycle) {
      cpu.addClockEvent(() => portD.setPin(pin, high), cycle - cpu.cycles);
    },
    takeOutput() {
      let text = '';
      for (let start = 0; start < output.length; start += 4096) text += String.fromCharCode(...output.slice(start, start + 4096));
      output.length = 0;
      return text;
    },
    receive(text) {
      for (let index = 0; index < text.length; index++) incoming.push(text.charCodeAt(index) & 0xff);
      pump();
    },
    untouchedSramBytes(staticDataBytes) {
      let untouched = 0;
      for (let address = sramStart + staticDataBytes; address < sramStart + sramBytes && cpu.data[address] === stackPaint; address++) untouched++;
      return untouched;
    },
  };
  return chip;
}

type InterruptConfig = Parameters<CPU['setInterruptFlag']>[0];
const UDRE0 = 0x20;
const TXC0 = 0x40;

/** UDR0 as a buffer ahead of the shift register (see the top of this file). */
/** One frame on the line: start bit, 5-9 data bits, parity bit if on, 1 or 2 stop bits, each (UBRR + 1) x 16 (or x 8 with U2X) cycles. */
function cyclesPerCharacter(cpu: CPU): number {
  const { UCSRA, UCSRB, UCSRC, UBRRH, UBRRL } = usart0Config;
  const control = cpu.data[UCSRC];
  const dataBits = cpu.data[UCSRB] & 0x04 ? 9 : 5 + ((control >> 1) & 3);
  const bits = 1 + dataBits + (control & 0x20 ? 1 : 0) + (control & 0x08 ? 2 : 1);
  const divider = ((cpu.data[UBRRH] << 8) | cpu.data[UBRRL]) + 1;
  return divider * (cpu.data[UCSRA] & 0x02 ? 8 : 16) * bits;
}

function transmitWithBuffer(cpu: CPU, send: (byte: number) => void): void {
  const { UCSRA, UCSRB, UDR } = usart0Config;
  const dataRegisterEmpty: InterruptConfig = { address: usart0Config.dataRegisterEmptyInterrupt, flagRegister: UCSRA, flagMask: UDRE0, enableRegister: UCSRB, enableMask: UDRE0 };
  const transmitComplete: InterruptConfig = { address: usart0Config.txCompleteInterrupt, flagRegister: UCSRA, flagMask: TXC0, enableRegister: UCSRB, enableMask: TXC0 };
  let shifting = false;
  let waiting: number | null = null;
  const shift = (byte: number): void => {
    shifting = true;
    send(byte);
    cpu.addClockEvent(shifted, cyclesPerCharacter(cpu));
  };
  const shifted = (): void => {
    shifting = false;
    if (waiting !== null) {
      const byte = waiting;
      waiting = null;
      shift(byte);
      cpu.setInterruptFlag(dataRegisterEmpty);
    } else {
      cpu.setInterruptFlag(transmitComplete);
    }
  };
  cpu.writeHooks[UDR] = (value) => {
    cpu.clearInterrupt(transmitComplete);
    if (!shifting) {
      shift(value);
      return true;
    }
    waiting = value;
    cpu.clearInterrupt(dataRegisterEmpty);
    return true;
  };
}
