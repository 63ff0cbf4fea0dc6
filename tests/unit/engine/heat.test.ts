import { describe, expect, it } from 'vitest';
import { copperLossW, referenceMoveRmsTorqueNm, rmsTorqueNm, supplySizing, SUPPLY_MARGIN } from '@/engine';

describe('copperLossW', () => {
  it('when 1.2 A RMS flows in both 1.8 Ω phases, then 5.184 W is lost (derived: Joule, P = 2·I²·R)', () => {
    expect(copperLossW({ currentRmsA: 1.2, phaseResistanceOhm: 1.8 })).toBeCloseTo(5.184, 12);
  });

  it('when the two phases carry microstepped sine and cosine currents, then the loss averaged over a cycle matches (independent: time average)', () => {
    // Arrange: peak √2·I in each phase, 90° apart, sampled over one electrical cycle
    const i = 1.5;
    const r = 2.4;
    const n = 1000;
    let sum = 0;
    for (let k = 0; k < n; k++) {
      const ph = (2 * Math.PI * k) / n;
      sum += (Math.SQRT2 * i * Math.sin(ph)) ** 2 * r + (Math.SQRT2 * i * Math.cos(ph)) ** 2 * r;
    }
    // Act / Assert
    expect(copperLossW({ currentRmsA: i, phaseResistanceOhm: r })).toBeCloseTo(sum / n, 10);
  });

  it('when the current is negative, then it throws naming currentRmsA', () => {
    expect(() => copperLossW({ currentRmsA: -1, phaseResistanceOhm: 1 })).toThrow(/currentRmsA/);
  });
});

describe('supplySizing', () => {
  it('when two motors each lose 5 W and deliver 3 W at 24 V, then the supply needs 16 W × 1.25 = 20 W, 0.833 A', () => {
    // Act
    const s = supplySizing({
      motors: [
        { copperLossW: 5, mechanicalW: 3 },
        { copperLossW: 5, mechanicalW: 3 },
      ],
      supplyV: 24,
    });
    // Assert
    expect(s.drawW).toBe(16);
    expect(s.powerW).toBeCloseTo(16 * SUPPLY_MARGIN, 12);
    expect(s.currentA).toBeCloseTo((16 * SUPPLY_MARGIN) / 24, 12);
  });
});

describe('rmsTorqueNm', () => {
  it('when 0.3 N·m acts half the time and nothing the rest, then the RMS is 0.3/√2 (derived)', () => {
    expect(
      rmsTorqueNm([
        { torqueNm: 0.3, timeS: 1 },
        { torqueNm: 0, timeS: 1 },
      ]),
    ).toBeCloseTo(0.3 / Math.SQRT2, 12);
  });
});

describe('referenceMoveRmsTorqueNm', () => {
  it('when a 100 mm trapezoidal move is sampled finely in time, then the RMS torque matches (independent: numerical integration)', () => {
    // Arrange: 0.1 m at 0.2 m/s and 3 m/s², then 0.1 s dwell; torques 0.25 / 0.02 / −0.21 N·m
    const args = {
      distanceMm: 100,
      speedMmPerS: 200,
      accelMmPerS2: 3000,
      accelTorqueNm: 0.25,
      cruiseTorqueNm: 0.02,
      decelTorqueNm: -0.21,
      dwellS: 0.1,
    };
    const ramp = 0.2 / 3;
    const total = 0.1 / 0.2 + 0.2 / 3 + 0.1;
    const n = 200000;
    let sum = 0;
    for (let k = 0; k < n; k++) {
      const t = ((k + 0.5) / n) * total;
      const move = 0.1 / 0.2 + 0.2 / 3;
      const tq = t < ramp ? 0.25 : t < move - ramp ? 0.02 : t < move ? -0.21 : 0;
      sum += tq * tq;
    }
    // Act
    const r = referenceMoveRmsTorqueNm(args);
    // Assert
    expect(r.rmsTorqueNm).toBeCloseTo(Math.sqrt(sum / n), 4);
    expect(r.moveS).toBeCloseTo(0.566667, 5);
  });
});
