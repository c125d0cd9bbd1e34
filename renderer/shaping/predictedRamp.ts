/**
 * The model's ramp over one mains cycle (0-360 electrical degrees) for drawing: the ramp starts after the reset,
 * charges through the half-cycle and resets at the next zero crossing; a full-wave board does it in both halves,
 * a half-wave board sits at the floor through the second half. DOM-free for unit tests.
 */
import type { BoardDesign } from '../../app/board/design';
import { rampVoltageAt, type RampPrediction } from '../../app/board/rampModel';
import type { Point } from './foldPoints';

export function predictedRampPoints(design: BoardDesign, prediction: RampPrediction, pointsPerHalfCycle = 180): Point[] {
  const halfCycleS = 1 / (2 * design.mainsHz);
  const points: Point[] = [];
  const halves = design.rectifier === 'full-wave' ? [0, 1] : [0];
  for (let half = 0; half < 2; half++) {
    for (let index = 0; index <= pointsPerHalfCycle; index++) {
      const withinS = (index / pointsPerHalfCycle) * halfCycleS;
      const degrees = half * 180 + (index / pointsPerHalfCycle) * 180;
      const charging = halves.includes(half) && withinS >= prediction.startDelayS;
      points.push({ x: degrees, y: charging ? rampVoltageAt(prediction, withinS - prediction.startDelayS) : prediction.floorV });
    }
  }
  return points;
}
