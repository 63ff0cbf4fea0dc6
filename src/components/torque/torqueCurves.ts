import { motorTorqueNm, torqueConstantNmPerA, type DriverSpec, type MotorSpec, type TorquePoint } from '@/engine';

/** A motor on the shelf as far as the torque model needs it. */
export type ShelfMotor = Omit<MotorSpec, 'torqueCurve'> & { torqueCurve?: TorquePoint[] | null };

/** Points of a curve to plot: speed [rev/s] and torque [N·m]. */
export interface CurveSeries {
  speedRevPerS: number[];
  torqueNm: number[];
}

/**
 * The engine's model torque–speed curve of a motor on a driver (the uploaded table ignored), sampled from standstill to
 * a little past the speed where the back-EMF reaches the supply (where the model's torque ends) or past the table's
 * last speed, whichever is higher.
 * @param motor - the shelf motor
 * @param driver - supply voltage [V] and RMS phase current [A]
 * @param points - samples (default 121)
 * @returns speeds [rev/s] and model torques [N·m]
 */
export function modelCurve(motor: ShelfMotor, driver: Pick<DriverSpec, 'supplyV' | 'currentRmsA'>, points = 121): CurveSeries {
  const model: MotorSpec = { ...motor, torqueCurve: null };
  const fullDriver: DriverSpec = { microsteps: 16, ...driver };
  const backEmfLimit = driver.supplyV / torqueConstantNmPerA(model) / (2 * Math.PI);
  const tableTop = motor.torqueCurve?.length ? motor.torqueCurve[motor.torqueCurve.length - 1].speedRevPerS : 0;
  const top = Math.max(backEmfLimit, tableTop) * 1.05;
  const speedRevPerS = Array.from({ length: points }, (_, i) => (top * i) / (points - 1));
  return { speedRevPerS, torqueNm: speedRevPerS.map((n) => motorTorqueNm({ motor: model, driver: fullDriver, speedRevPerS: n })) };
}

/** The uploaded table as plot series (empty when there is none). */
export function tableCurve(motor: ShelfMotor): CurveSeries {
  const curve = motor.torqueCurve ?? [];
  return { speedRevPerS: curve.map((p) => p.speedRevPerS), torqueNm: curve.map((p) => p.torqueNm) };
}
