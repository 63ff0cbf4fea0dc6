import { describe, expect, it } from 'vitest';
import {
  computeEnvelope,
  defaultDesign,
  directionLimits,
  evaluateDesign,
  kinematicsMatrix,
  moveTimeS,
  samplePullCurve,
  type DesignInput,
  type EnvelopeInput,
} from '@/engine';

function design(edit: (d: DesignInput) => DesignInput = (d) => d, mech: DesignInput['mechanism'] = 'corexy'): DesignInput {
  return edit({ ...defaultDesign(mech), map: { points: 21 } });
}

describe('evaluateSecondLayer (through evaluateDesign)', () => {
  it('when a crossed-belt stage is evaluated, then the modes are listed lowest first and the lowest of all is the first', () => {
    // Act
    const r = evaluateDesign(design());
    // Assert
    const f = r.modes.map((m) => m.frequencyHz);
    expect([...f].sort((a, b) => a - b)).toEqual(f);
    expect(r.stiffness.lowest.frequencyHz).toBeCloseTo(f[0], 9);
    expect(r.stiffness.lowest.modeId).toBe(r.modes[0].id);
    expect(r.modes.map((m) => m.id).sort()).toEqual(['belt', 'gantry-bending', 'gantry-yaw']);
    // the belt mode in the list is the stiffness map's own minimum
    expect(r.modes.find((m) => m.id === 'belt')!.frequencyHz).toBeCloseTo(r.stiffness.min.frequencyHz, 9);
    expect(r.shaping.frequencyHz).toBe(r.stiffness.lowest.frequencyHz);
  });

  it('when an H-belt stage is evaluated, then gantry yaw is reported as not held by the belts', () => {
    const r = evaluateDesign(design((d) => d, 'hbot'));
    expect(r.modes.map((m) => m.id)).not.toContain('gantry-yaw');
    expect(r.modesNotHeld.map((m) => m.id)).toEqual(['gantry-yaw']);
    expect(r.modesNotHeld[0].message).toMatch(/slide along X/);
  });

  it('when a cartesian stage has one Y motor, then its yaw mode goes through the cross shaft and a thinner shaft lowers it', () => {
    // Act
    const thick = evaluateDesign(design((d) => ({ ...d, crossShaft: { diameterMm: 12, shearModulusGPa: 79.3 } }), 'cartesian'));
    const thin = evaluateDesign(design((d) => ({ ...d, crossShaft: { diameterMm: 4, shearModulusGPa: 79.3 } }), 'cartesian'));
    // Assert
    const yaw = (r: typeof thick) => r.modes.find((m) => m.id === 'cross-shaft')!.frequencyHz;
    expect(yaw(thin)).toBeLessThan(yaw(thick));
    expect(thin.structure.crossShaft!.stiffnessNmPerRad / thick.structure.crossShaft!.stiffnessNmPerRad).toBeCloseTo((4 / 12) ** 4, 10);
  });

  it('when the gantry beam is left empty, then the typical values of the frame profile are used and said to be typical', () => {
    const r = evaluateDesign(design());
    expect(r.structure.gantryBeam).toMatchObject({ secondMomentMm4: 6900, modulusGPa: 69, massKgPerM: 0.5 });
    expect(r.structure.gantryBeam.typical).toEqual({ secondMoment: true, modulus: true, mass: true, profile: '20 × 20 mm profile' });
  });

  it('when the worst error point is reported, then its total is the sum of its four terms and the largest of the map', () => {
    const r = evaluateDesign(design());
    const w = r.errorBudget.worst;
    expect(w.totalMm).toBeCloseTo(w.stretchMm + w.loadAngleMm + w.deadbandMm + w.runoutMm, 12);
    expect(w.totalMm).toBeCloseTo(Math.max(...r.errorBudget.totalMm.flat()), 12);
    // crossed belts: an eccentric drive pulley moves the carriage by its eccentricity (derived)
    expect(w.runoutMm).toBeCloseTo(0.02, 12);
  });

  it('when the drive pulleys wrap θ at 40 N pretension, then each motor shaft takes 2·40·sin(θ/2) (derived)', () => {
    const r = evaluateDesign(design());
    const wrap = (r.belts[0].driveWrapDeg * Math.PI) / 180;
    expect(r.loads.motorShaftRadialN.atPretension).toBeCloseTo(80 * Math.sin(wrap / 2), 9);
  });

  it('when 1.2 A flows in 1.8 Ω phases, then each motor loses 5.184 W and the supply covers the sum with its margin (derived)', () => {
    const r = evaluateDesign(design());
    r.heat.motors.forEach((m) => expect(m.copperLossW).toBeCloseTo(5.184, 9));
    expect(r.heat.supply.drawW).toBeCloseTo(
      r.heat.motors.reduce((s, m) => s + m.copperLossW + m.mechanicalW, 0),
      9,
    );
  });

  it('when a crossed-belt stage cruises at 300 mm/s with 80 steps/mm, then the diagonal needs √2 × 24 000 microsteps/s (derived)', () => {
    const r = evaluateDesign(design());
    expect(r.excitation.microstepRateHzAtCruise).toBeCloseTo(300 * 80 * Math.SQRT2, 6);
  });

  it('when a job runs along X within the planned acceleration, then each move is the trapezoid of the plan (derived) and dwells add', () => {
    // Arrange: 3 m/s² planned, 300 mm/s cruise; the motors give more than that along X at cruise
    const d = design((x) => ({
      ...x,
      job: {
        points: [
          { xMm: 10, yMm: 10, dwellS: 0.25 },
          { xMm: 210, yMm: 10, dwellS: 0.25 },
          { xMm: 10, yMm: 10, dwellS: 0 },
        ],
      },
    }));
    // Act
    const r = evaluateDesign(d);
    // Assert
    const one = moveTimeS({ distanceMm: 200, speedMmPerS: 300, accelMmPerS2: 3000 });
    expect(r.job!.moves.map((m) => m.timeS)).toEqual([expect.closeTo(one, 9), expect.closeTo(one, 9)]);
    expect(r.job!.totalS).toBeCloseTo(2 * one + 0.5, 9);
    expect(r.job!.moves[1].directionDeg).toBeCloseTo(180, 9);
  });

  it('when the motors could go faster than the plan, then the job at the motors’ limits is quicker, and never slower', () => {
    const d = design((x) => ({
      ...x,
      job: {
        points: [
          { xMm: 10, yMm: 10, dwellS: 0 },
          { xMm: 210, yMm: 150, dwellS: 0 },
          { xMm: 30, yMm: 60, dwellS: 0 },
        ],
      },
    }));
    const job = evaluateDesign(d).job!;
    expect(job.atLimits!.totalS!).toBeLessThan(job.totalS!);
  });

  it('when a job has no points, then there is no job section', () => {
    expect(evaluateDesign(design((x) => ({ ...x, job: { points: [] } }))).job).toBeNull();
  });
});

describe('directionLimits', () => {
  it('when evaluated along the envelope’s directions at standstill, then it gives the envelope’s acceleration at rest and top speed', () => {
    // Arrange: a crossed-belt envelope input with a falling pull curve (0 → 40 N over 0 … 1.2 m/s)
    const k = kinematicsMatrix('corexy');
    const curve = samplePullCurve((v) => 40 * (1 - v / 1.2), 1.2);
    const inp: EnvelopeInput = {
      k,
      xKg: 0.4,
      yKg: 0.85,
      motorEquivalentKg: [0.15, 0.15],
      beltCarriedKg: [0.01, 0.01],
      frictionXN: 2,
      frictionYN: 3,
      pull: [curve, curve],
      cruiseMPerS: 0.3,
      directions: 360,
    };
    const env = computeEnvelope(inp);
    const lim = directionLimits(inp);
    // Act / Assert: every 15th direction
    for (let i = 0; i < 360; i += 15) {
      const along = lim.along((env.directionsDeg[i] * Math.PI) / 180);
      expect(along.accelMPerS2(0)).toBeCloseTo(env.accelMaxMPerS2[i], 6);
      expect(along.speedMPerS).toBeCloseTo(env.speedMaxMPerS[i], 6);
      // the acceleration left for a ramp that ends at the top speed is gone
      expect(along.accelMPerS2(env.speedMaxMPerS[i])).toBeLessThan(1e-6 + env.accelMaxMPerS2[i] * 0.01);
    }
  });
});
