/**
 * A second, differently built computation for the jerk-limited move time: the S-curve is stepped through in time
 * (jerk +j until the acceleration or the speed limit calls for easing off, and so on), its distance integrated
 * numerically, and the peak speed of a short move found by bisection on that simulated distance. Only the
 * kinematic limits are shared with the engine's closed form.
 */

/** Distance and time of a ramp from rest to `peak` under limits a, j, integrated in small time steps [m, s]. */
function simulatedRamp(peak: number, a: number, j: number, steps = 200000): { distance: number; time: number } {
  // Ease-off point: the speed gained while the acceleration falls back to zero is acc²/(2j).
  const acc = Math.min(a, Math.sqrt(peak * j));
  const rise = acc / j;
  const hold = Math.max(0, peak / acc - acc / j);
  const total = 2 * rise + hold;
  const h = total / steps;
  let x = 0;
  let v = 0;
  let ac = 0;
  for (let i = 0; i < steps; i++) {
    const t = (i + 0.5) * h;
    const jerk = t < rise ? j : t < rise + hold ? 0 : -j;
    // exact polynomial step for constant jerk
    x += v * h + (ac * h * h) / 2 + (jerk * h * h * h) / 6;
    v += ac * h + (jerk * h * h) / 2;
    ac += jerk * h;
  }
  return { distance: x, time: total };
}

/**
 * Quickest rest-to-rest move of length s under speed, acceleration and jerk limits, by simulation [s].
 * @param s - distance [m]
 * @param vMax - speed limit [m/s]
 * @param a - acceleration limit [m/s²]
 * @param j - jerk limit [m/s³]
 */
export function simulatedSCurveTimeS(s: number, vMax: number, a: number, j: number): number {
  const full = simulatedRamp(vMax, a, j);
  if (2 * full.distance <= s) return 2 * full.time + (s - 2 * full.distance) / vMax;
  let lo = 0;
  let hi = vMax;
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2;
    if (2 * simulatedRamp(mid, a, j, 50000).distance < s) lo = mid;
    else hi = mid;
  }
  return 2 * simulatedRamp((lo + hi) / 2, a, j).time;
}
