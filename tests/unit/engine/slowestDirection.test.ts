import { describe, expect, it } from 'vitest';
import {
  compareMechanisms,
  defaultDesign,
  evaluateDesign,
  keyFigures,
  modelTopSpeedRevPerS,
  slowestDirection,
  sweep,
  type DesignInput,
  type DesignResult,
} from '@/engine';

/** A frictionless CoreXY: every direction's top speed is where the motor's torque curve ends. */
function frictionless(): DesignInput {
  return { ...defaultDesign('corexy'), frictionN: { x: 0, y: 0 }, map: { points: 5 } };
}

describe('slowestDirection', () => {
  it('when a frictionless CoreXY runs out of speed at the curve end, then the worst speed is the diagonal one, axis speed over √2', () => {
    // Arrange: derived — belt speed = curve end [rev/s] × teeth × pitch (docs/models/motor-torque.md §4); along 45°
    // one motor runs √2 faster than the carriage (CoreXY 2012, CXY-INV-DIAG), so the diagonal is the slowest way.
    const d = frictionless();
    const axisMPerS = (modelTopSpeedRevPerS(d.motor, d.driver) * d.pulley.driveTeeth * d.belt.pitchMm) / 1000;
    const expected = axisMPerS / Math.SQRT2;
    // Act
    const r = evaluateDesign(d);
    // Assert: the speed along the worst-acceleration direction is another (higher) number, which is not the worst speed
    expect(r.envelope.axes.worst.directionDeg).not.toBe(45);
    expect(r.envelope.axes.worst.speedMaxMPerS).toBeGreaterThan(expected * 1.01);
    expect(slowestDirection(r.envelope).speedMaxMPerS).toBeCloseTo(expected, 6);
    expect(slowestDirection(r.envelope).directionDeg % 90).toBe(45);
  });

  it('when the worst speed is asked of the summary, the comparison and the sweep, then all three give the diagonal speed', () => {
    // Arrange: derived as above
    const d = frictionless();
    const expected = (modelTopSpeedRevPerS(d.motor, d.driver) * d.pulley.driveTeeth * d.belt.pitchMm) / 1000 / Math.SQRT2;
    // Act
    const fromResult = keyFigures(evaluateDesign(d)).speedMaxMPerS.worst;
    const row = compareMechanisms(d).rows[0];
    const point = sweep(d, 'pulley.driveTeeth', [d.pulley.driveTeeth]).points[0];
    // Assert
    expect(fromResult).toBeCloseTo(expected, 6);
    expect(row.ok && row.speedMaxMPerS.worst).toBeCloseTo(expected, 6);
    expect(point.ok && point.speedMaxMPerS.worst).toBeCloseTo(expected, 6);
  });

  it('when a result stored before engine 2.2 has no slowest axis, then the direction is found from its arrays', () => {
    // Arrange
    const r = evaluateDesign(frictionless());
    const { slowest, ...older } = r.envelope.axes;
    const stored = { ...r.envelope, axes: older } as unknown as DesignResult['envelope'];
    // Act
    const found = slowestDirection(stored);
    // Assert
    expect(found).toEqual(slowest);
  });
});
