import { requireNumber, throwInputError } from './errors';
import { rotorTeeth } from './drive';
import type { DriverSpec, MotorSpec, TorquePoint } from './types';

// The model and its derivation: docs/models/motor-torque.md.

/**
 * Torque constant of a two-phase hybrid stepper per ampere of peak phase current. Holding torque is quoted with
 * both phases at rated DC current, which equals a sine of peak √2·I_rated, hence k_t = T_hold/(√2·I_rated).
 * @param motor - motor data (holdingTorqueNm [N·m], ratedCurrentA [A])
 * @returns k_t = k_e [N·m/A = V·s/rad]
 * @see docs/models/motor-torque.md §1
 */
export function torqueConstantNmPerA(motor: Pick<MotorSpec, 'holdingTorqueNm' | 'ratedCurrentA'>): number {
  const t = requireNumber('torqueConstantNmPerA', 'motor.holdingTorqueNm', motor?.holdingTorqueNm, 0, Infinity, true);
  const i = requireNumber('torqueConstantNmPerA', 'motor.ratedCurrentA', motor?.ratedCurrentA, 0, Infinity, true);
  return t / (Math.SQRT2 * i);
}

/**
 * Peak phase current the model lets the driver use: the sine's peak √2·I_rms, but never more than the motor's
 * rating √2·I_rated. Current above the rating saturates the iron and overheats the winding, so the model gives
 * it no torque (the `driver-current` check warns instead).
 * @param motor - motor data (ratedCurrentA [A])
 * @param driver - driver data (currentRmsA [A])
 * @returns I_p [A, peak]
 * @see docs/models/motor-torque.md §2
 */
export function effectivePeakCurrentA(motor: Pick<MotorSpec, 'ratedCurrentA'>, driver: Pick<DriverSpec, 'currentRmsA'>): number {
  return Math.SQRT2 * Math.min(driver.currentRmsA, motor.ratedCurrentA);
}

/** The per-phase circuit of the pull-out calculation, SI. */
interface PhaseCircuit {
  /** k_t = k_e [N·m/A]. */
  kt: number;
  /** Phase resistance R [Ω]. */
  r: number;
  /** Phase inductance L [H]. */
  l: number;
  /** Rotor teeth N_r. */
  nr: number;
  /** Current limit I_p [A, peak]. */
  iPeak: number;
  /** Supply limit on the phase voltage's peak V [V]. */
  v: number;
}

/**
 * Largest torque at shaft speed ω_m over every current phasor I (I_q in phase with the back-EMF E, I_d in
 * quadrature) with |I| ≤ I_p and |I·Z + E| ≤ V. In the (I_q, I_d) plane the second constraint is a disc of radius
 * V/|Z| about c = −E/Z, the first a disc of radius I_p about 0; the largest I_q over their intersection is the
 * rightmost point of one disc if it lies in the other, else the upper crossing of the two circles.
 */
function pullOutAt(c: PhaseCircuit, omegaM: number): number {
  const w = Math.abs(omegaM);
  const e = c.kt * w;
  const x = c.nr * w * c.l;
  const z2 = c.r * c.r + x * x;
  const { iPeak, v, kt } = c;
  if (z2 === 0) return kt * iPeak; // no impedance: the supply never limits
  const z = Math.sqrt(z2);
  const rho = v / z; // voltage disc radius [A]
  const cq = (-e * c.r) / z2; // centre, in-phase part [A]
  const cd = (e * x) / z2; // centre, quadrature part [A]
  const d = e / z; // |c|
  // Current disc's rightmost point (I_p, 0) inside the voltage disc: the current limit alone binds.
  if ((iPeak - cq) ** 2 + cd * cd <= rho * rho * (1 + 1e-12)) return kt * iPeak;
  // Voltage disc's rightmost point inside the current disc: the voltage limit alone binds.
  const vq = cq + rho;
  if (vq * vq + cd * cd <= iPeak * iPeak * (1 + 1e-12)) return Math.max(0, kt * vq);
  // Discs apart: no current phasor meets both limits; the torque has already fallen through zero before this.
  if (d >= iPeak + rho || d === 0) return 0;
  // Both bind: the crossing of |I| = I_p and |I − c| = ρ with the larger in-phase part.
  const a = (iPeak * iPeak - rho * rho + d * d) / (2 * d);
  const h = Math.sqrt(Math.max(0, iPeak * iPeak - a * a));
  const iq = (a * cq + h * Math.abs(cd)) / d;
  return Math.max(0, kt * iq);
}

function phaseCircuit(scope: string, motor: MotorSpec, driver: DriverSpec): PhaseCircuit {
  const r = requireNumber(scope, 'motor.phaseResistanceOhm', motor.phaseResistanceOhm, 0);
  const l = requireNumber(scope, 'motor.phaseInductanceMh', motor.phaseInductanceMh, 0) / 1000;
  const nr = rotorTeeth(requireNumber(scope, 'motor.stepAngleDeg', motor.stepAngleDeg, 0, 90, true));
  requireNumber(scope, 'driver.currentRmsA', driver.currentRmsA, 0);
  const v = requireNumber(scope, 'driver.supplyV', driver.supplyV, 0);
  return { kt: torqueConstantNmPerA(motor), r, l, nr, iPeak: effectivePeakCurrentA(motor, driver), v };
}

/**
 * Pull-out torque of a two-phase hybrid stepper with a free load angle (the rotor lags until the torque suffices),
 * from the per-phase phasor model: the best current phasor under the driver's current limit (capped at the
 * motor's rating) and the supply-voltage limit. No torque table, no margin. Falls smoothly with speed; it has
 * no ceiling at V/k_e.
 * @param args.motor - motor data (the design document's "motor"; a torque table is ignored here)
 * @param args.driver - driver data (supplyV [V], currentRmsA [A])
 * @param args.speedRevPerS - shaft speed [rev/s]
 * @returns pull-out torque [N·m]
 * @see docs/models/motor-torque.md §3 (closed form) and §5 (what the model leaves out)
 */
export function pullOutTorqueNm(args: { motor: MotorSpec; driver: DriverSpec; speedRevPerS: number }): number {
  const s = 'pullOutTorqueNm';
  if (!args || typeof args.motor !== 'object' || args.motor === null) throwInputError(s, 'is required', 'motor');
  if (typeof args.driver !== 'object' || args.driver === null) throwInputError(s, 'is required', 'driver');
  const speed = requireNumber(s, 'speedRevPerS', args.speedRevPerS);
  return pullOutAt(phaseCircuit(s, args.motor, args.driver), 2 * Math.PI * speed);
}

/**
 * Linear interpolation in an uploaded torque–speed table. Below the first speed the first torque holds;
 * beyond the last speed the motor is taken to have no torque, because a table says nothing about speeds it
 * does not reach and the envelope must not promise them.
 * @param curve - points sorted by speed [rev/s, N·m]
 * @param speedRevPerS - shaft speed [rev/s]
 * @returns torque [N·m]
 */
export function interpolateTorqueCurve(curve: readonly TorquePoint[], speedRevPerS: number): number {
  const n = Math.abs(speedRevPerS);
  if (curve.length === 0) throwInputError('interpolateTorqueCurve', 'needs at least one point', 'motor.torqueCurve');
  if (n <= curve[0].speedRevPerS) return curve[0].torqueNm;
  for (let i = 1; i < curve.length; i++) {
    const p1 = curve[i];
    if (n <= p1.speedRevPerS) {
      const p0 = curve[i - 1];
      const t = (n - p0.speedRevPerS) / (p1.speedRevPerS - p0.speedRevPerS);
      return p0.torqueNm + t * (p1.torqueNm - p0.torqueNm);
    }
  }
  return 0;
}

/**
 * Builds the torque–speed function of a motor and driver once, validating the data a single time, so that
 * callers sampling it thousands of times (the envelope) pay only the arithmetic.
 * @param motor - motor data (the design document's "motor")
 * @param driver - driver data (the design document's "driver")
 * @returns available torque [N·m] as a function of shaft speed [rev/s], margin not applied
 * @see docs/models/motor-torque.md
 */
export function torqueSpeedFunction(motor: MotorSpec, driver: DriverSpec): (speedRevPerS: number) => number {
  const s = 'torqueSpeedFunction';
  if (typeof motor !== 'object' || motor === null) throwInputError(s, 'is required', 'motor');
  if (typeof driver !== 'object' || driver === null) throwInputError(s, 'is required', 'driver');
  const curve = motor.torqueCurve;
  if (curve && curve.length > 0) return (n: number) => interpolateTorqueCurve(curve, n);
  const c = phaseCircuit(s, motor, driver);
  return (n: number) => pullOutAt(c, 2 * Math.PI * n);
}

/**
 * Available motor torque at a shaft speed, torque margin NOT applied: an uploaded torque table when the motor has
 * one, otherwise the pull-out torque of {@link pullOutTorqueNm}.
 * @param args.motor - motor data (the design document's "motor")
 * @param args.driver - driver data (the design document's "driver": supplyV [V], currentRmsA [A])
 * @param args.speedRevPerS - shaft speed [rev/s]
 * @returns available torque [N·m]
 * @see docs/models/motor-torque.md
 */
export function motorTorqueNm(args: { motor: MotorSpec; driver: DriverSpec; speedRevPerS: number }): number {
  const s = 'motorTorqueNm';
  if (!args || typeof args.motor !== 'object' || args.motor === null) throwInputError(s, 'is required', 'motor');
  if (typeof args.driver !== 'object' || args.driver === null) throwInputError(s, 'is required', 'driver');
  const speed = requireNumber(s, 'speedRevPerS', args.speedRevPerS);
  return torqueSpeedFunction(args.motor, args.driver)(speed);
}

/** Share of the standstill torque below which the model's curve ends (see {@link modelTopSpeedRevPerS}). */
export const MODEL_TAIL_SHARE = 0.05;
/** The model's curve ends at the latest at this multiple of V/k_e (see {@link modelTopSpeedRevPerS}). */
export const MODEL_TOP_FACTOR = 5;

/**
 * Where the sampled model curve ends. The pull-out torque of the model falls roughly as 1/ω at high speed and
 * never quite reaches zero, but below a few per cent of the standstill torque the effects the model leaves out
 * (detent torque, iron loss, bearing drag: each of that order) are as large as what it keeps, so the curve is
 * not trusted there: it ends where τ first falls to 5 % of the standstill torque, and at the latest at 5·V/k_e
 * (about 5000 rpm for a common 24 V motor, beyond what stepper datasheets plot).
 * @param motor - motor data (no torque table)
 * @param driver - driver data
 * @returns top speed of the model curve [rev/s]
 * @see docs/models/motor-torque.md §4
 */
export function modelTopSpeedRevPerS(motor: MotorSpec, driver: DriverSpec): number {
  const c = phaseCircuit('modelTopSpeedRevPerS', motor, driver);
  const cap = (c.v / c.kt / (2 * Math.PI)) * MODEL_TOP_FACTOR;
  const floor = MODEL_TAIL_SHARE * pullOutAt(c, 0);
  const at = (n: number) => pullOutAt(c, 2 * Math.PI * n);
  if (at(cap) > floor) return cap;
  // The curve is non-increasing in speed (tested), so bisection finds the crossing.
  let lo = 0;
  let hi = cap;
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2;
    if (at(mid) > floor) lo = mid;
    else hi = mid;
  }
  return hi;
}

/**
 * Small-angle holding stiffness of a hybrid stepper at its driven current: τ = T·sin(N_r·θ) gives
 * k_θ = N_r·T near the detent. T is the low-speed torque at the driver's current (holding torque scaled by
 * min(I_rms, I_rated)/I_rated, since current above the rating buys nothing), or a table's first torque.
 * @param motor - motor data
 * @param driver - driver data
 * @returns angular stiffness [N·m/rad]
 * @see docs/models/stiffness-and-ringing.md §2
 */
export function motorHoldingStiffnessNmPerRad(motor: MotorSpec, driver: DriverSpec): number {
  const low =
    motor.torqueCurve && motor.torqueCurve.length > 0
      ? motor.torqueCurve[0].torqueNm
      : (motor.holdingTorqueNm * Math.min(driver.currentRmsA, motor.ratedCurrentA)) / motor.ratedCurrentA;
  return rotorTeeth(motor.stepAngleDeg) * low;
}
