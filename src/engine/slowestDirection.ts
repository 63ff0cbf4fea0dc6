import type { AxisLimits, DesignResult } from './types';

/**
 * Index of the direction with the lowest top speed (the first of equals).
 * @param speedMaxMPerS - top speed per envelope direction [m/s]
 * @returns index into the envelope's direction arrays
 */
export function slowestIndex(speedMaxMPerS: readonly number[]): number {
  let slow = 0;
  for (let i = 1; i < speedMaxMPerS.length; i++) if (speedMaxMPerS[i] < speedMaxMPerS[slow] - 1e-12) slow = i;
  return slow;
}

/**
 * "Top speed, worst direction": the direction with the lowest top speed over all directions, the speed the stage
 * reaches whichever way it moves (docs/models/envelope.md §3). Not the speed along the worst-acceleration direction,
 * which can be faster. Results stored before engine 2.2 lack `axes.slowest`; it is found from their arrays.
 * @param envelope - a result's envelope
 * @returns direction [°], acceleration at rest and at cruise [m/s²] and top speed [m/s] there
 */
export function slowestDirection(envelope: DesignResult['envelope']): AxisLimits {
  const stored = (envelope.axes as Partial<DesignResult['envelope']['axes']>).slowest;
  if (stored) return stored;
  const i = slowestIndex(envelope.speedMaxMPerS);
  return {
    directionDeg: envelope.directionsDeg[i],
    accelMaxMPerS2: envelope.accelMaxMPerS2[i],
    accelAtCruiseMPerS2: envelope.accelAtCruiseMPerS2[i],
    speedMaxMPerS: envelope.speedMaxMPerS[i],
  };
}
