import { describe, expect, it } from 'vitest';
import { defaultDesign, evaluateDesign, torqueTableCheck, type DesignInput } from '@/engine';

const TABLE = [
  { speedRevPerS: 0, torqueNm: 0.4 },
  { speedRevPerS: 10, torqueNm: 0.3 },
  { speedRevPerS: 20, torqueNm: 0.15 },
];

/** A design with a torque table measured at `at` (or with no conditions recorded). */
function withTable(at: { supplyV: number; currentRmsA: number } | null, driver = { supplyV: 24, currentRmsA: 1.2 }): DesignInput {
  const d = defaultDesign('hbot');
  return { ...d, motor: { ...d.motor, torqueCurve: TABLE, torqueCurveConditions: at }, driver: { ...d.driver, ...driver } };
}

describe('torqueTableCheck', () => {
  it('when the design uses the motor model, then there is no check', () => {
    const d = defaultDesign('hbot');
    expect(torqueTableCheck(d.motor, d.driver)).toBeNull();
  });

  it.each([
    // [table measured at, design drives at, severity] — 5 % either way is our judgement
    [{ supplyV: 24, currentRmsA: 1.2 }, { supplyV: 24, currentRmsA: 1.2 }, 'ok'],
    [{ supplyV: 24, currentRmsA: 1.2 }, { supplyV: 25, currentRmsA: 1.24 }, 'ok'],
    [{ supplyV: 36, currentRmsA: 1.2 }, { supplyV: 24, currentRmsA: 1.2 }, 'warn'],
    [{ supplyV: 24, currentRmsA: 1.7 }, { supplyV: 24, currentRmsA: 1.2 }, 'warn'],
  ] as const)('when the table was measured at %o and the design drives %o, then the check is %s', (at, driver, severity) => {
    // Arrange
    const d = withTable(at, driver);
    // Act
    const check = torqueTableCheck(d.motor, d.driver)!;
    // Assert
    expect(check.severity).toBe(severity);
    expect(check.id).toBe('torque-table-conditions');
    expect(check.subject).toBe('Motor torque table');
  });

  it('when the table does not record its conditions, then it warns and names the design’s own supply and current', () => {
    const d = withTable(null);
    const check = torqueTableCheck(d.motor, d.driver)!;
    expect(check.severity).toBe('warn');
    expect(check.parts).toContainEqual({ value: 24, kind: 'voltageV' });
    expect(check.parts).toContainEqual({ value: 1.2, kind: 'currentA' });
  });

  it('when a design with a mismatched table is evaluated, then its checks carry the warning', () => {
    const r = evaluateDesign(withTable({ supplyV: 36, currentRmsA: 1.2 }));
    const check = r.checks.find((c) => c.id === 'torque-table-conditions');
    expect(check?.severity).toBe('warn');
    expect(check?.message).toContain('measured at 36 V and 1.2 A; this design drives it at 24 V and 1.2 A');
  });
});
