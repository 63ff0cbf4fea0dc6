import { describe, expect, it } from 'vitest';
import {
  computeEnvelope,
  couplingShares,
  defaultDesign,
  evaluateDesign,
  kinematicsMatrix,
  modelTopSpeedRevPerS,
  motorForcesN,
  samplePullCurve,
  type DesignInput,
  type EnvelopeInput,
  type Mechanism,
} from '@/engine';
import { randomDesign, SEEDS } from './helpers/randomDesign';

/** A design whose belt mass, pulley inertia and friction are negligible, torque margin 1 (for closed forms). */
function bare(mech: Mechanism, extra: Partial<DesignInput> = {}): DesignInput {
  const d = defaultDesign(mech);
  return {
    ...d,
    belt: { ...d.belt, linearMassKgPerM: 1e-12 },
    pulley: { ...d.pulley, driveInertiaKgM2: 0, idlerInertiaKgM2: 0 },
    frictionN: { x: 0, y: 0 },
    torqueMargin: 1,
    map: { points: 5 },
    ...extra,
  };
}

function lowSpeedTorque(d: DesignInput): number {
  return (d.motor.holdingTorqueNm * d.driver.currentRmsA) / d.motor.ratedCurrentA;
}

describe('computeEnvelope (closed forms)', () => {
  // Derivation for crossed belts, K = [[1, 1], [1, −1]], K⁻ᵀ = ½·[[1, 1], [1, −1]], at rest (pull P = τ/r each):
  //   motor i must give (K⁻ᵀ·M·u)ᵢ·a + (J/r²)·(K·u)ᵢ·a, M = diag(m_x, m_y).
  //   X (u = (1, 0)):  K·u = (1, 1),  K⁻ᵀ·M·u = (m_x/2, m_x/2)   → a = (τ/r) / (m_x/2 + J/r²)
  //   Y (u = (0, 1)):  K·u = (1, −1), K⁻ᵀ·M·u = (m_y/2, −m_y/2)  → a = (τ/r) / (m_y/2 + J/r²)
  //   45° (u = (1, 1)/√2): K·u = (√2, 0), K⁻ᵀ·M·u = ((m_x + m_y), (m_x − m_y))/(2√2);
  //     motor A: a = (τ/r)/((m_x + m_y)/(2√2) + √2·J/r²) = √2·(τ/r)/((m_x + m_y)/2 + 2J/r²);
  //     motor B only holds (m_y − m_x)/(2√2)·a, a smaller load, so A limits.
  it.each(['corexy', 'hbot'] as const)('when a bare %s design accelerates from rest, then X, Y and 45° match the closed forms', (mech) => {
    // Arrange
    const d = bare(mech);
    const r = (d.pulley.driveTeeth * d.belt.pitchMm) / (2 * Math.PI) / 1000;
    const pull = lowSpeedTorque(d) / r;
    const jr = d.motor.rotorInertiaKgM2 / (r * r);
    const mx = d.masses.carriageKg + d.masses.toolKg;
    const my = mx + d.masses.gantryKg;
    // Act
    const res = evaluateDesign(d);
    // Assert
    expect(res.envelope.axes.x.accelMaxMPerS2).toBeCloseTo(pull / (mx / 2 + jr), 6);
    expect(res.envelope.axes.y.accelMaxMPerS2).toBeCloseTo(pull / (my / 2 + jr), 6);
    expect(res.envelope.axes.diagonal.accelMaxMPerS2).toBeCloseTo((Math.SQRT2 * pull) / ((mx + my) / 2 + 2 * jr), 6);
    expect(res.envelope.limitingMotor[45]).toBe('A');
  });

  // Cartesian: K = I; X: a = (τ/r)/(m_x + J/r²); Y with two synchronised motors: a = (2τ/r)/(m_y + 2J/r²).
  it('when a bare cartesian design with two Y motors accelerates from rest, then X and Y match the closed forms', () => {
    const d = bare('cartesian', { yMotors: 2 });
    const r = (d.pulley.driveTeeth * d.belt.pitchMm) / (2 * Math.PI) / 1000;
    const pull = lowSpeedTorque(d) / r;
    const jr = d.motor.rotorInertiaKgM2 / (r * r);
    const mx = d.masses.carriageKg + d.masses.toolKg;
    const my = mx + d.masses.gantryKg + d.motor.massKg;
    const res = evaluateDesign(d);
    expect(res.envelope.axes.x.accelMaxMPerS2).toBeCloseTo(pull / (mx + jr), 6);
    expect(res.envelope.axes.y.accelMaxMPerS2).toBeCloseTo((2 * pull) / (my + 2 * jr), 6);
  });

  it('when friction is zero, then the X speed limit is where the model curve ends (no ceiling at V/k_e)', () => {
    // Arrange
    const d = bare('corexy');
    const ke = d.motor.holdingTorqueNm / (Math.SQRT2 * d.motor.ratedCurrentA);
    const backEmfRevPerS = d.driver.supplyV / ke / (2 * Math.PI);
    // Act
    const res = evaluateDesign(d);
    // Assert: the curve ends at the model top (docs/models/motor-torque.md §4), well past V/k_e
    const top = modelTopSpeedRevPerS(d.motor, d.driver);
    expect(top).toBeGreaterThan(backEmfRevPerS);
    expect(res.envelope.axes.x.speedMaxMPerS).toBeCloseTo((top * d.pulley.driveTeeth * d.belt.pitchMm) / 1000, 6);
    // Along 45° one motor runs √2 faster than the carriage (CoreXY 2012, CXY-INV-DIAG).
    expect(res.envelope.axes.diagonal.speedMaxMPerS).toBeCloseTo(res.envelope.axes.x.speedMaxMPerS / Math.SQRT2, 6);
  });

  it('when the driver current is above the motor rating, then the stage gains no acceleration and the check warns', () => {
    // Arrange
    const d = defaultDesign('corexy');
    const rated = evaluateDesign({ ...d, driver: { ...d.driver, currentRmsA: d.motor.ratedCurrentA } });
    // Act
    const over = evaluateDesign({ ...d, driver: { ...d.driver, currentRmsA: 2 * d.motor.ratedCurrentA } });
    // Assert
    expect(over.envelope.accelMaxMPerS2).toEqual(rated.envelope.accelMaxMPerS2);
    expect(over.envelope.speedMaxMPerS).toEqual(rated.envelope.speedMaxMPerS);
    expect(over.checks.find((c) => c.id === 'driver-current')!.severity).toBe('warn');
  });

  it('when friction exceeds what the motors can pull, then the stage cannot move in that direction', () => {
    const d = { ...bare('corexy'), frictionN: { x: 500, y: 0 } };
    const res = evaluateDesign(d);
    expect(res.envelope.axes.x.accelMaxMPerS2).toBe(0);
    expect(res.envelope.axes.x.speedMaxMPerS).toBe(0);
    expect(res.envelope.axes.y.accelMaxMPerS2).toBeGreaterThan(0);
  });
});

describe('computeEnvelope (properties over random designs)', () => {
  it.each((['corexy', 'hbot'] as const).flatMap((m) => SEEDS.map((s) => [m, s] as const)))(
    'when a square %s design (seed %i) is evaluated, then its envelope is symmetric about the X axis',
    (mech, seed) => {
      const res = evaluateDesign(randomDesign(seed, mech, { square: true }));
      const e = res.envelope;
      for (let i = 1; i < 180; i++) {
        expect(e.accelMaxMPerS2[360 - i]).toBeCloseTo(e.accelMaxMPerS2[i], 9);
        expect(e.accelAtCruiseMPerS2[360 - i]).toBeCloseTo(e.accelAtCruiseMPerS2[i], 9);
        expect(e.speedMaxMPerS[360 - i]).toBeCloseTo(e.speedMaxMPerS[i], 9);
      }
    },
  );

  it.each((['corexy', 'hbot', 'cartesian'] as const).flatMap((m) => SEEDS.slice(0, 8).map((s) => [m, s] as const)))(
    'when a %s design (seed %i) gets more torque (current, margin), then no direction loses acceleration',
    (mech, seed) => {
      const d = randomDesign(seed, mech);
      const base = evaluateDesign(d).envelope;
      const more = evaluateDesign({
        ...d,
        driver: { ...d.driver, currentRmsA: Math.min(d.motor.ratedCurrentA, d.driver.currentRmsA * 1.2) },
        torqueMargin: Math.min(1, d.torqueMargin * 1.1),
      }).envelope;
      for (let i = 0; i < 360; i++) {
        expect(more.accelMaxMPerS2[i]).toBeGreaterThanOrEqual(base.accelMaxMPerS2[i] - 1e-9);
        expect(more.accelAtCruiseMPerS2[i]).toBeGreaterThanOrEqual(base.accelAtCruiseMPerS2[i] - 1e-9);
      }
    },
  );

  it.each((['corexy', 'hbot', 'cartesian'] as const).flatMap((m) => SEEDS.slice(0, 8).map((s) => [m, s] as const)))(
    'when a %s design (seed %i) gets a heavier carriage, then no direction gains acceleration',
    (mech, seed) => {
      const d = randomDesign(seed, mech);
      const base = evaluateDesign(d).envelope;
      const heavy = evaluateDesign({ ...d, masses: { ...d.masses, carriageKg: d.masses.carriageKg * 1.5 } }).envelope;
      for (let i = 0; i < 360; i++) {
        expect(heavy.accelMaxMPerS2[i]).toBeLessThanOrEqual(base.accelMaxMPerS2[i] + 1e-9);
        expect(heavy.accelAtCruiseMPerS2[i]).toBeLessThanOrEqual(base.accelAtCruiseMPerS2[i] + 1e-9);
      }
    },
  );
});

describe('motorForcesN', () => {
  it('when the envelope limit is applied along a direction, then the limiting motor uses exactly its available pull', () => {
    // Arrange: a flat pull curve of 30 N per motor
    const flat = samplePullCurve(() => 30, 2, 5);
    const inp: EnvelopeInput = {
      k: kinematicsMatrix('corexy'),
      xKg: 0.4,
      yKg: 0.9,
      motorEquivalentKg: [0.15, 0.15],
      beltCarriedKg: [0.01, 0.01],
      frictionXN: 2,
      frictionYN: 3,
      pull: [flat, flat],
      cruiseMPerS: 0.2,
      directions: 360,
    };
    // Act
    const env = computeEnvelope(inp);
    // Assert
    for (const deg of [0, 30, 45, 100, 200, 300]) {
      const f = motorForcesN(inp, (deg * Math.PI) / 180, env.accelMaxMPerS2[deg]);
      const lim = env.limitingMotor[deg] === 'A' ? 0 : 1;
      expect(Math.abs(f[lim])).toBeCloseTo(30, 6);
      expect(Math.abs(f[1 - lim])).toBeLessThanOrEqual(30 + 1e-6);
    }
  });

  it('when the coupling shares are read from the envelope, then they are K·u and K⁻ᵀ·u', () => {
    const flat = samplePullCurve(() => 30, 2, 5);
    const k = kinematicsMatrix('hbot', { a: -1, b: 1 });
    const env = computeEnvelope({
      k,
      xKg: 0.4,
      yKg: 0.9,
      motorEquivalentKg: [0.1, 0.1],
      beltCarriedKg: [0, 0],
      frictionXN: 0,
      frictionYN: 0,
      pull: [flat, flat],
      cruiseMPerS: 0.1,
      directions: 360,
    });
    for (const deg of [0, 17, 45, 181, 270]) {
      const s = couplingShares(k, (deg * Math.PI) / 180);
      expect(env.speedShareA[deg]).toBeCloseTo(s.speedA, 12);
      expect(env.forceShareB[deg]).toBeCloseTo(s.forceB, 12);
    }
  });
});
