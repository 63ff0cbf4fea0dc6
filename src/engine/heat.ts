import { requireNumber, throwInputError } from './errors';
import { moveTimeS } from './moveTime';

// Heat and supply (docs/models/heat-and-supply.md): copper loss, supply sizing and the RMS torque of a move.

/**
 * Copper loss of a two-phase stepper: each phase carries a sine (or cosine) of RMS value I, so the two together
 * dissipate P = 2·I²·R at every instant of a microstepped cycle (sin² + cos² = 1), moving or holding.
 * @param args.currentRmsA - RMS phase current the driver sets I [A]
 * @param args.phaseResistanceOhm - resistance of one phase R [Ω]
 * @param args.phases - number of phases (default 2)
 * @returns copper loss [W]
 * @see Joule's law P = I²·R per winding; docs/models/heat-and-supply.md
 */
export function copperLossW(args: { currentRmsA: number; phaseResistanceOhm: number; phases?: number }): number {
  const s = 'copperLossW';
  const i = requireNumber(s, 'currentRmsA', args?.currentRmsA, 0);
  const r = requireNumber(s, 'phaseResistanceOhm', args?.phaseResistanceOhm, 0);
  const n = requireNumber(s, 'phases', args?.phases ?? 2, 1, 10);
  return n * i * i * r;
}

/** Head-room a supply should keep over the estimated draw (our judgement: 25 %, a common sizing allowance). */
export const SUPPLY_MARGIN = 1.25;

/**
 * Supply sizing: every motor's copper loss plus the peak mechanical power it delivers, times a head-room factor;
 * the current follows at the supply voltage. Driver and iron losses are left out (they are small beside the
 * copper loss of a stepper run at its rated current), which the margin also covers.
 * @param args.motors - copper loss and peak mechanical output of each motor [W]
 * @param args.supplyV - supply voltage [V]
 * @param args.margin - head-room factor (default {@link SUPPLY_MARGIN}) [-]
 * @returns supply power and current with the margin, and the draw without it [W, A]
 * @see docs/models/heat-and-supply.md
 */
export function supplySizing(args: { motors: { copperLossW: number; mechanicalW: number }[]; supplyV: number; margin?: number }): {
  powerW: number;
  currentA: number;
  drawW: number;
  margin: number;
} {
  const s = 'supplySizing';
  const v = requireNumber(s, 'supplyV', args?.supplyV, 0, Infinity, true);
  const margin = requireNumber(s, 'margin', args?.margin ?? SUPPLY_MARGIN, 1);
  if (!Array.isArray(args.motors)) throwInputError(s, 'must be a list', 'motors');
  const draw = args.motors.reduce((sum, m) => sum + m.copperLossW + Math.max(0, m.mechanicalW), 0);
  return { powerW: draw * margin, currentA: (draw * margin) / v, drawW: draw, margin };
}

/**
 * RMS of a torque that is piecewise constant in time: √(Σ τᵢ²·tᵢ / Σ tᵢ).
 * @param segments - torque and duration of each piece [N·m, s]
 * @returns RMS torque [N·m]
 * @see motor sizing practice (the thermally equivalent constant torque; common practice)
 */
export function rmsTorqueNm(segments: { torqueNm: number; timeS: number }[]): number {
  let num = 0;
  let den = 0;
  for (const p of segments) {
    const t = requireNumber('rmsTorqueNm', 'timeS', p?.timeS, 0);
    num += p.torqueNm * p.torqueNm * t;
    den += t;
  }
  return den > 0 ? Math.sqrt(num / den) : 0;
}

/**
 * RMS torque of a reference move repeated back to back: a point-to-point move (trapezoidal, or triangular when too
 * short to reach the speed) with the torque of each phase, then an optional dwell at zero torque.
 * @param args.distanceMm - move length [mm]
 * @param args.speedMmPerS - cruise speed [mm/s]
 * @param args.accelMmPerS2 - acceleration [mm/s²]
 * @param args.accelTorqueNm - motor torque while accelerating [N·m]
 * @param args.cruiseTorqueNm - motor torque at constant speed (friction) [N·m]
 * @param args.decelTorqueNm - motor torque while braking [N·m]
 * @param args.dwellS - pause after the move (default 0) [s]
 * @returns RMS torque [N·m] and the move's phase durations [s]
 * @see docs/models/heat-and-supply.md
 */
export function referenceMoveRmsTorqueNm(args: {
  distanceMm: number;
  speedMmPerS: number;
  accelMmPerS2: number;
  accelTorqueNm: number;
  cruiseTorqueNm: number;
  decelTorqueNm: number;
  dwellS?: number;
}): { rmsTorqueNm: number; rampS: number; cruiseS: number; moveS: number } {
  const s = args.distanceMm;
  const v = args.speedMmPerS;
  const a = args.accelMmPerS2;
  const move = moveTimeS({ distanceMm: s, speedMmPerS: v, accelMmPerS2: a });
  const reaches = s >= (v * v) / a;
  const ramp = reaches ? v / a : move / 2;
  const cruise = reaches ? move - 2 * ramp : 0;
  const dwell = requireNumber('referenceMoveRmsTorqueNm', 'dwellS', args.dwellS ?? 0, 0);
  return {
    rmsTorqueNm: rmsTorqueNm([
      { torqueNm: args.accelTorqueNm, timeS: ramp },
      { torqueNm: args.cruiseTorqueNm, timeS: cruise },
      { torqueNm: args.decelTorqueNm, timeS: ramp },
      { torqueNm: 0, timeS: dwell },
    ]),
    rampS: ramp,
    cruiseS: cruise,
    moveS: move,
  };
}

/** Heat and supply section of the result (docs/models/heat-and-supply.md). */
export interface HeatResult {
  /** Every motor (two on the Y coordinate of a cartesian stage with two Y motors). */
  motors: {
    id: string;
    label: string;
    /** 2·I²·R at the driver's current [W]. */
    copperLossW: number;
    /** Largest mechanical output over the directions at the cruise speed [W]. */
    mechanicalW: number;
    /** RMS torque over the reference cycle [N·m]. */
    rmsTorqueNm: number;
    /** Holding torque at the rated current: the torque the motor may give continuously [N·m]. */
    continuousTorqueNm: number;
  }[];
  totalCopperLossW: number;
  supply: { powerW: number; currentA: number; drawW: number; margin: number; supplyV: number };
  /** The reference cycle the RMS torque is taken over: across the X travel, then across the Y travel. */
  referenceMoves: { directionDeg: number; distanceMm: number; speedMPerS: number; accelMPerS2: number; moveS: number }[];
}
