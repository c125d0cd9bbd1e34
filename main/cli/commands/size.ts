/**
 * `rampwright size`: from targets to a complete part set in standard values, verified with the board model,
 * written as a board design file with --out (app/board/sizeBoard.ts).
 */
import type { Command } from 'commander';
import { formatFarad, formatOhm, formatPercent, formatVolt } from '../../../app/board/formatValues';
import { parseQuantity } from '../../../app/board/parseQuantity';
import { partName } from '../../../app/board/partNames';
import { sizeBoard, type SizingResult } from '../../../app/board/sizeBoard';
import { sizingTargetsSchema } from '../../../app/board/sizingTargets';
import { InputError } from '../../../app/errors';
import { saveBoardDesign } from '../../board/loadBoardDesign';
import { jsonOutput } from '../jsonOutput';

interface SizeOptions {
  name?: string;
  supply: string;
  mains: string;
  rectifier: string;
  rampHeight: string;
  capacitor: string;
  series?: string;
  emitterDrop?: string;
  dividerCurrent?: string;
  alphaMax?: string;
  resetUs?: string;
  out?: string;
  json?: boolean;
}

function quantity(text: string | undefined, option: string): number | undefined {
  if (text === undefined) return undefined;
  const value = parseQuantity(text);
  if (!Number.isFinite(value)) throw new InputError(`"${text}" is not a number (e.g. 15, 470n, 4k7)`, `--${option}`);
  return value;
}

const optionOfField: Record<string, string> = {
  supplyV: 'supply',
  mainsHz: 'mains',
  rectifier: 'rectifier',
  rampTargetV: 'ramp-height',
  cRampFarad: 'capacitor',
  series: 'series',
  emitterDropFraction: 'emitter-drop',
  dividerCurrentA: 'divider-current',
  alphaMaxDeg: 'alpha-max',
  syncResetUs: 'reset-us',
};

function printHuman(result: SizingResult, out: string | undefined): void {
  const { design, prediction, tolerance } = result;
  const parts = design.parts;
  const lines = [
    `Sized board: ${design.name} (${design.mainsHz} Hz ${design.rectifier}, ${design.supplyV} V supply)`,
    `  ${partName(design, 'rEmitter').padEnd(24)} ${formatOhm(parts.rEmitter.ohm).padEnd(6)} exact ${formatOhm(result.exactOhm.rEmitter, 4)}, ${parts.rEmitter.tolerancePct} %`,
    `  ${partName(design, 'rBiasTop').padEnd(24)} ${formatOhm(parts.rBiasTop.ohm).padEnd(6)} ideal ${formatOhm(result.exactOhm.rBiasTop, 4)}`,
    `  ${partName(design, 'rBiasBottom').padEnd(24)} ${formatOhm(parts.rBiasBottom.ohm).padEnd(6)} ideal ${formatOhm(result.exactOhm.rBiasBottom, 4)}`,
    `  ${partName(design, 'cRamp').padEnd(24)} ${formatFarad(parts.cRamp.farad).padEnd(6)} chosen`,
  ];
  if (parts.rControlTop && result.exactOhm.rControlTop !== null) {
    lines.push(`  ${partName(design, 'rControlTop').padEnd(24)} ${formatOhm(parts.rControlTop.ohm).padEnd(6)} exact ${formatOhm(result.exactOhm.rControlTop, 4)} (${partName(design, 'potControl')} ${formatOhm(parts.potControl?.ohm ?? 0)}, limits alpha to ${design.alphaMaxDeg} deg)`);
  }
  // The two kinds of reference value differ: say so, or a divider picked well away from its ideal reads as a mistake.
  lines.push(
    '  (emitter resistor, exact: lands on the ramp height with the divider as picked. Divider, ideal: for the emitter',
    '   drop asked; the divider and the emitter resistor are then picked together in standard values.)',
  );
  lines.push(
    `Predicted: charging current ${(prediction.chargingCurrentA * 1e3).toFixed(3)} mA, slope ${(prediction.slopeVPerS / 1000).toFixed(3)} V/ms, ` +
      `peak ${formatVolt(prediction.peakV)} (${formatPercent(result.peakErrorPct)} from ${formatVolt(design.rampTargetV)}), clipping at ${formatVolt(prediction.clipV)} (${formatVolt(prediction.headroomV)} headroom)`,
    `Tolerance (${tolerance.runs} runs, seed ${tolerance.seed}): peak ${formatVolt(tolerance.peakV.mean)} +- ${formatVolt(tolerance.peakV.standardDeviation)}, ` +
      `worst case ${formatVolt(tolerance.worstCase.peakLowV)} to ${formatVolt(tolerance.worstCase.peakHighV)}` +
      (tolerance.alphaDeg && tolerance.controlV !== null
        ? `; alpha at ${formatVolt(tolerance.controlV)}: ${tolerance.alphaDeg.mean.toFixed(1)} +- ${tolerance.alphaDeg.standardDeviation.toFixed(1)} deg`
        : ''),
  );
  for (const note of result.notes) lines.push(`Note: ${note}`);
  if (out) lines.push(`Written to ${out}`);
  process.stdout.write(`${lines.join('\n')}\n`);
}

export function registerSizeCommand(program: Command): void {
  program
    .command('size')
    .description('Size the ramp current source and control limit in standard values, verify with the board model')
    .requiredOption('--supply <volts>', 'supply of the current source (V)')
    .requiredOption('--mains <hertz>', 'mains frequency (Hz)')
    .requiredOption('--rectifier <kind>', 'half-wave or full-wave')
    .requiredOption('--ramp-height <volts>', 'ramp height wanted at the end of the charging interval (V)')
    .requiredOption('--capacitor <farad>', 'the ramp capacitor chosen (e.g. 470n)')
    .option('--series <name>', 'E-series to pick values from (E6, E12, E24, E48, E96, E192)', 'E24')
    .option('--emitter-drop <fraction>', 'share of the supply across the emitter resistor (default 0.15)')
    .option('--divider-current <amperes>', 'current through the base divider (default: stiff-divider rule)')
    .option('--alpha-max <degrees>', 'largest firing angle the control may reach (default 165)')
    .option('--reset-us <microseconds>', 'reset time around each zero crossing (default 300)')
    .option('--name <text>', 'name of the board design')
    .option('--out <file>', 'write the board design (*.board.json)')
    .option('--json', 'print the result as JSON')
    .action(async (options: SizeOptions) => {
      const input = {
        name: options.name,
        supplyV: quantity(options.supply, 'supply'),
        mainsHz: quantity(options.mains, 'mains'),
        rectifier: options.rectifier,
        rampTargetV: quantity(options.rampHeight, 'ramp-height'),
        cRampFarad: quantity(options.capacitor, 'capacitor'),
        series: options.series?.toUpperCase(),
        emitterDropFraction: quantity(options.emitterDrop, 'emitter-drop'),
        dividerCurrentA: quantity(options.dividerCurrent, 'divider-current'),
        alphaMaxDeg: quantity(options.alphaMax, 'alpha-max'),
        syncResetUs: quantity(options.resetUs, 'reset-us'),
      };
      const parsed = sizingTargetsSchema.safeParse(input);
      if (!parsed.success) {
        const issue = parsed.error.issues[0];
        const field = String(issue.path[0] ?? '');
        throw new InputError(issue.message, `--${optionOfField[field] ?? field}`);
      }
      let result: SizingResult;
      try {
        result = sizeBoard(parsed.data);
      } catch (error) {
        if (error instanceof InputError && error.where && optionOfField[error.where]) {
          throw new InputError(error.message.slice(error.where.length + 2), `--${optionOfField[error.where]}`);
        }
        throw error;
      }
      if (options.out) await saveBoardDesign(options.out, result.design);
      if (options.json) {
        const { design, prediction, peakErrorPct, tolerance, exactOhm, notes } = result;
        process.stdout.write(jsonOutput({ design, prediction, peakErrorPct, tolerance, exactOhm, notes, out: options.out ?? null }));
      } else {
        printHuman(result, options.out);
      }
    });
}
