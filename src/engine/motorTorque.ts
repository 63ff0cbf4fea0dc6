import { requireNumber, throwInputError } from './errors';
import { rotorTeeth } from './drive';
import type { DriverSpec, MotorSpec, TorquePoint } from './types';

/**
 * Torque constant of a two-phase hybrid stepper per ampere of peak phase current. Holding torque is quoted with
 * both phases at rated DC current, which equals a sine of peak √2·I_rated, hence k_t = T_hold/(√2·I_rated).
 * @param motor - motor data (holdingTorqueNm [N·m], ratedCurrentA [A])
 * @returns k_t = k_e [N·m/A = V·s/rad]
 * @see engine.md §5; T. Kenjo & A. Sugawara, Stepping Motors and Their Microprocessor Controls, 2nd ed. (from memory)
 */
export function torqueConstantNmPerA(motor: Pick<MotorSpec, 'holdingTorqueNm' | 'ratedCurrentA'>): number {
  const t = requireNumber('torqueConstantNmPerA', 'motor.holdingTorqueNm', motor?.holdingTorqueNm, 0, Infinity, true);
  const i = requireNumber('torqueConstantNmPerA', 'motor.ratedCurrentA', motor?.ratedCurrentA, 0, Infinity, true);
  return t / (Math.SQRT2 * i);
}

/**
 * Peak phase current the supply can still push at a shaft speed, with the current in phase with the back-EMF
 * (full bridge per phase): V² = (I·R + k_e·ω_m)² + (I·ω_e·L)², ω_e = N_r·ω_m. Zero from ω_m = V/k_e on.
 * @param args.motor - motor data (R [Ω], L [mH], step angle [°])
 * @param args.supplyV - driver supply voltage V [V]
 * @param args.keVsPerRad - back-EMF constant k_e [V·s/rad]
 * @param args.speedRadPerS - shaft speed ω_m [rad/s]
 * @returns largest drivable peak current [A]
 * @see standard synchronous-machine phasor equation with i_d = 0 (from memory)
 */
export function supplyLimitedCurrentA(args: {
  motor: Pick<MotorSpec, 'phaseResistanceOhm' | 'phaseInductanceMh' | 'stepAngleDeg'>;
  supplyV: number;
  keVsPerRad: number;
  speedRadPerS: number;
}): number {
  const r = args.motor.phaseResistanceOhm;
  const l = args.motor.phaseInductanceMh / 1000;
  const e = args.keVsPerRad * Math.abs(args.speedRadPerS);
  const v = args.supplyV;
  if (e >= v) return 0;
  const x = rotorTeeth(args.motor.stepAngleDeg) * Math.abs(args.speedRadPerS) * l;
  const zz = r * r + x * x;
  if (zz === 0) return Infinity;
  // (R²+X²)·I² + 2·E·R·I + (E² − V²) = 0, positive root.
  const disc = e * e * r * r - zz * (e * e - v * v);
  return (-e * r + Math.sqrt(disc)) / zz;
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
 * @param motor - motor data (format.md "motor")
 * @param driver - driver data (format.md "driver")
 * @returns available torque [N·m] as a function of shaft speed [rev/s], margin not applied
 * @see engine.md §5
 */
export function torqueSpeedFunction(motor: MotorSpec, driver: DriverSpec): (speedRevPerS: number) => number {
  const s = 'torqueSpeedFunction';
  if (typeof motor !== 'object' || motor === null) throwInputError(s, 'is required', 'motor');
  if (typeof driver !== 'object' || driver === null) throwInputError(s, 'is required', 'driver');
  const curve = motor.torqueCurve;
  if (curve && curve.length > 0) return (n: number) => interpolateTorqueCurve(curve, n);
  const r = requireNumber(s, 'motor.phaseResistanceOhm', motor.phaseResistanceOhm, 0);
  const l = requireNumber(s, 'motor.phaseInductanceMh', motor.phaseInductanceMh, 0) / 1000;
  const nr = rotorTeeth(requireNumber(s, 'motor.stepAngleDeg', motor.stepAngleDeg, 0, 90, true));
  const iPeak = Math.SQRT2 * requireNumber(s, 'driver.currentRmsA', driver.currentRmsA, 0);
  const v = requireNumber(s, 'driver.supplyV', driver.supplyV, 0);
  const kt = torqueConstantNmPerA(motor);
  return (n: number) => {
    const w = 2 * Math.PI * Math.abs(n);
    const e = kt * w;
    if (e >= v) return 0;
    const x = nr * w * l;
    const zz = r * r + x * x;
    // (R² + X²)·I² + 2·E·R·I + (E² − V²) = 0, positive root; with no impedance the supply is no limit.
    const iSupply = zz === 0 ? Infinity : (-e * r + Math.sqrt(e * e * r * r - zz * (e * e - v * v))) / zz;
    return kt * Math.min(iPeak, iSupply);
  };
}

/**
 * Available motor torque at a shaft speed, torque margin NOT applied. With a `torqueCurve` the table is
 * interpolated; otherwise the phasor model of engine.md §5: τ = k_t·min(√2·I_rms, I_supply(ω)).
 * @param args.motor - motor data (format.md "motor")
 * @param args.driver - driver data (format.md "driver": supplyV [V], currentRmsA [A])
 * @param args.speedRevPerS - shaft speed [rev/s]
 * @returns available torque [N·m]
 * @see engine.md §5; P. P. Acarnley, Stepping Motors, 4th ed., hybrid-motor chapter (from memory)
 */
export function motorTorqueNm(args: { motor: MotorSpec; driver: DriverSpec; speedRevPerS: number }): number {
  const s = 'motorTorqueNm';
  if (!args || typeof args.motor !== 'object' || args.motor === null) throwInputError(s, 'is required', 'motor');
  if (typeof args.driver !== 'object' || args.driver === null) throwInputError(s, 'is required', 'driver');
  const speed = requireNumber(s, 'speedRevPerS', args.speedRevPerS);
  return torqueSpeedFunction(args.motor, args.driver)(speed);
}

/**
 * Small-angle holding stiffness of a hybrid stepper at its driven current: τ = T·sin(N_r·θ) gives
 * k_θ = N_r·T near the detent. T is the low-speed torque at the driver's current (holding torque scaled by
 * I_rms/I_rated), since a stepper run below its rating holds with that torque, not the catalogue one.
 * @param motor - motor data
 * @param driver - driver data
 * @returns angular stiffness [N·m/rad]
 * @see engine.md §7 (k_θ ≈ N_r·T_hold)
 */
export function motorHoldingStiffnessNmPerRad(motor: MotorSpec, driver: DriverSpec): number {
  const low =
    motor.torqueCurve && motor.torqueCurve.length > 0
      ? motor.torqueCurve[0].torqueNm
      : (motor.holdingTorqueNm * driver.currentRmsA) / motor.ratedCurrentA;
  return rotorTeeth(motor.stepAngleDeg) * low;
}
