/**
 * A second, differently built computation for the vibration tests: a single damped mode driven by a command
 * acceleration, x'' + 2ζω·x' + ω²·x = −a(t), integrated with the classical fourth-order Runge–Kutta method in
 * small fixed steps. Tests compare the engine's closed forms with what this simulation leaves ringing.
 */

/** Result of a simulation: the free vibration that remains after the command has ended. */
export interface Ringing {
  /** Amplitude of the remaining oscillation [m] (for ζ > 0, its value at the end of the command). */
  amplitudeM: number;
}

/**
 * Simulates the mode until the command ends and returns the amplitude of the oscillation that remains.
 * @param accel - command acceleration a(t) [m/s²], zero from `endS` on
 * @param endS - time the command ends [s]
 * @param frequencyHz - undamped natural frequency [Hz]
 * @param dampingRatio - ζ [-]
 * @param steps - integration steps up to `endS`
 * @returns the remaining amplitude
 */
export function residualAfter(accel: (tS: number) => number, endS: number, frequencyHz: number, dampingRatio = 0, steps = 20000): Ringing {
  const w = 2 * Math.PI * frequencyHz;
  const z = dampingRatio;
  const h = endS / steps;
  let x = 0;
  let v = 0;
  const f = (t: number, xx: number, vv: number): [number, number] => [vv, -accel(t) - 2 * z * w * vv - w * w * xx];
  for (let i = 0; i < steps; i++) {
    const t = i * h;
    const k1 = f(t, x, v);
    const k2 = f(t + h / 2, x + (h / 2) * k1[0], v + (h / 2) * k1[1]);
    const k3 = f(t + h / 2, x + (h / 2) * k2[0], v + (h / 2) * k2[1]);
    const k4 = f(t + h, x + h * k3[0], v + h * k3[1]);
    x += (h / 6) * (k1[0] + 2 * k2[0] + 2 * k3[0] + k4[0]);
    v += (h / 6) * (k1[1] + 2 * k2[1] + 2 * k3[1] + k4[1]);
  }
  const wd = w * Math.sqrt(1 - z * z);
  return { amplitudeM: Math.sqrt(x * x + ((v + z * w * x) / wd) ** 2) };
}
