import { eigs, inv, multiply } from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
  beamBendingFrequencyHz,
  beamEffectiveMassShare,
  gantryYawMass,
  generalizedEigen3,
  lowestModeMap,
  shaftTorsionStiffnessNmPerRad,
  typicalGantryBeam,
  yawModeFrequencyHz,
} from '@/engine';
import { feBeamFrequencyHz } from './helpers/beamFe';

describe('beamEffectiveMassShare', () => {
  it('when the load is at mid-span, then 17/35 of the beam moves with it (published: Rayleigh energy method, Rao, Mechanical Vibrations — from memory)', () => {
    expect(beamEffectiveMassShare({ spanMm: 400 })).toBeCloseTo(17 / 35, 12);
  });

  it('when the load moves toward a support, then the share grows and is symmetric about mid-span', () => {
    // Act
    const quarter = beamEffectiveMassShare({ spanMm: 400, positionMm: 100 });
    const threeQuarter = beamEffectiveMassShare({ spanMm: 400, positionMm: 300 });
    // Assert
    expect(quarter).toBeGreaterThan(17 / 35);
    expect(quarter).toBeCloseTo(threeQuarter, 12);
  });
});

describe('beamBendingFrequencyHz', () => {
  it('when the beam carries no point mass, then Rayleigh is within 0.8 % above the exact first mode (published: ω₁ = π²·√(EI/(μL⁴)), any vibrations text)', () => {
    // Arrange: 420 mm of 20 × 20 profile, typical values
    const l = 0.42;
    const ei = 69e9 * 6900e-12;
    const m = 0.5 * l;
    const exact = (Math.PI ** 2 * Math.sqrt(ei / ((m / l) * l ** 4))) / (2 * Math.PI);
    // Act
    const f = beamBendingFrequencyHz({ spanMm: 420, secondMomentMm4: 6900, modulusGPa: 69, beamMassKg: m, pointMassKg: 0 });
    // Assert: Rayleigh overestimates by √(48·35/17)/π² − 1 = 0.72 %
    expect(f / exact).toBeCloseTo(Math.sqrt((48 * 35) / 17) / Math.PI ** 2, 10);
    expect(f / exact - 1).toBeLessThan(0.008);
  });

  it('when a heavy carriage sits on a light beam, then f → (1/2π)·√(48EI/(L³·M)) (derived: mid-span stiffness of a simply supported beam)', () => {
    // Act
    const f = beamBendingFrequencyHz({ spanMm: 500, secondMomentMm4: 28000, modulusGPa: 69, beamMassKg: 1e-9, pointMassKg: 0.8 });
    // Assert
    const k = (48 * 69e9 * 28000e-12) / 0.5 ** 3;
    expect(f).toBeCloseTo(Math.sqrt(k / 0.8) / (2 * Math.PI), 6);
  });

  it.each([
    // [point/beam mass ratio, position as share of span, allowed excess]: the static deflection is a good mode
    // shape at mid-span; toward a support the beam's own mass bends the true mode away from it
    [0.5, 0.5, 0.01],
    [2, 0.5, 0.01],
    [5, 0.5, 0.01],
    [1, 0.25, 0.015],
    [3, 0.125, 0.03],
  ])(
    'when the point mass is %d × the beam at %d of the span, then Rayleigh is within %d of a finite-element model (independent)',
    (ratio, at, excess) => {
      // Arrange
      const l = 0.44;
      const beamKg = 0.5 * l;
      // Act
      const rayleigh = beamBendingFrequencyHz({
        spanMm: 440,
        secondMomentMm4: 6900,
        modulusGPa: 69,
        beamMassKg: beamKg,
        pointMassKg: ratio * beamKg,
        positionMm: at * 440,
      });
      const fe = feBeamFrequencyHz(l, 69e9 * 6900e-12, beamKg, ratio * beamKg, at, 48);
      // Assert: Rayleigh's quotient is an upper bound of the true frequency
      expect(rayleigh).toBeGreaterThanOrEqual(fe * (1 - 1e-6));
      expect(rayleigh / fe - 1).toBeLessThan(excess);
    },
  );

  it('when the span is 0, then it throws naming spanMm', () => {
    expect(() => beamBendingFrequencyHz({ spanMm: 0, secondMomentMm4: 1, modulusGPa: 1, beamMassKg: 1, pointMassKg: 1 })).toThrow(/spanMm/);
  });
});

describe('typicalGantryBeam', () => {
  it.each([
    [20, '20x20'],
    [25, '20x20'],
    [30, '30x30'],
    [45, '40x40'],
  ])('when the frame is made of %d mm profile, then the typical gantry beam is %s', (extrusionMm, id) => {
    expect(typicalGantryBeam(extrusionMm).id).toBe(id);
  });
});

describe('shaftTorsionStiffnessNmPerRad', () => {
  it('when an 8 mm steel shaft is 400 mm long, then it twists at 79.7 N·m/rad (derived: k = G·π·d⁴/(32·L), Gere, Mechanics of Materials — from memory)', () => {
    // Act
    const k = shaftTorsionStiffnessNmPerRad({ diameterMm: 8, lengthMm: 400, shearModulusGPa: 79.3 });
    // Assert: 79.3e9 · π · 0.008⁴ / 32 / 0.4
    expect(k).toBeCloseTo(79.7206, 3);
  });

  it('when the diameter doubles, then the stiffness grows sixteenfold (derived: d⁴ law)', () => {
    const a = shaftTorsionStiffnessNmPerRad({ diameterMm: 5, lengthMm: 300, shearModulusGPa: 79 });
    const b = shaftTorsionStiffnessNmPerRad({ diameterMm: 10, lengthMm: 300, shearModulusGPa: 79 });
    expect(b / a).toBeCloseTo(16, 10);
  });
});

describe('generalizedEigen3', () => {
  it.each([
    [
      { xx: 2, xy: 1, xz: 0, yy: 3, yz: 1, zz: 4 },
      { xx: 1, xy: 0, xz: 0, yy: 2, yz: 0.5, zz: 1 },
    ],
    [
      { xx: 5e5, xy: -1e5, xz: 3e4, yy: 4e5, yz: -2e4, zz: 8e3 },
      { xx: 0.4, xy: 0, xz: 0, yy: 0.9, yz: 0.05, zz: 0.012 },
    ],
  ])('when solving K·u = λ·M·u, then the eigenvalues match mathjs (library) and each pair satisfies the equation', (k, m) => {
    // Arrange
    const K = [
      [k.xx, k.xy, k.xz],
      [k.xy, k.yy, k.yz],
      [k.xz, k.yz, k.zz],
    ];
    const M = [
      [m.xx, m.xy, m.xz],
      [m.xy, m.yy, m.yz],
      [m.xz, m.yz, m.zz],
    ];
    // Act
    const r = generalizedEigen3(k, m);
    const lib = (eigs(multiply(inv(M), K) as number[][]).values as number[]).map(Number).sort((a, b) => a - b);
    // Assert
    r.values.forEach((v, i) => expect(v / lib[i]).toBeCloseTo(1, 9));
    r.vectors.forEach((u, i) => {
      const ku = K.map((row) => row.reduce((s, v, j) => s + v * u[j], 0));
      const mu = M.map((row) => row.reduce((s, v, j) => s + v * u[j], 0));
      const scale = Math.max(...ku.map(Math.abs));
      ku.forEach((v, j) => expect(Math.abs(v - r.values[i] * mu[j]) / scale).toBeLessThan(1e-9));
    });
  });

  it('when K and M are diagonal with a repeated value, then it still returns three finite pairs', () => {
    const r = generalizedEigen3({ xx: 4, xy: 0, xz: 0, yy: 4, yz: 0, zz: 9 }, { xx: 1, xy: 0, xz: 0, yy: 1, yz: 0, zz: 1 });
    expect(r.values).toEqual([4, 4, 9]);
    r.vectors.forEach((u) => expect(u.every(Number.isFinite)).toBe(true));
  });
});

describe('gantryYawMass', () => {
  it('when a 0.5 kg gantry spans 400 mm with the carriage 100 mm right of centre, then J = mS²/12 + m_c·e²', () => {
    const m = gantryYawMass({ xKg: 0.4, gantryKg: 0.5, spanMm: 400, points: [{ massKg: 0.4, offsetMm: 100 }] });
    expect(m.xKg).toBe(0.4);
    expect(m.yKg).toBeCloseTo(0.9, 12);
    expect(m.couplingKgM).toBeCloseTo(0.04, 12);
    expect(m.yawInertiaKgM2).toBeCloseTo((0.5 * 0.16) / 12 + 0.4 * 0.01, 12);
  });
});

describe('yawModeFrequencyHz', () => {
  it('when two equal Y springs hold a bare gantry at its ends, then yaw rings at √(6k/m_g)/2π (derived: k_φ = 2k·(S/2)², J = m_g·S²/12)', () => {
    // Arrange: spring k at each end, S = 0.4 m; x held by its own spring
    const k = 2e5;
    const half = 0.2;
    const stiffness = { xx: 3e5, xy: 0, xz: 0, yy: 2 * k, yz: 0, zz: 2 * k * half * half };
    const mass = gantryYawMass({ xKg: 0.3, gantryKg: 0.6, spanMm: 400, points: [] });
    // Act
    const f = yawModeFrequencyHz({ stiffness, mass, halfSpanMm: 200 });
    // Assert
    expect(f).toBeCloseTo(Math.sqrt((6 * k) / 0.6) / (2 * Math.PI), 6);
  });

  it('when the carriage sits off-centre, then the yaw frequency is the mathjs eigenvalue whose mode turns the gantry (library)', () => {
    // Arrange
    const k = 2e5;
    const stiffness = { xx: 3e5, xy: 0, xz: 0, yy: 2 * k, yz: 0, zz: 2 * k * 0.04 };
    const mass = gantryYawMass({ xKg: 0.3, gantryKg: 0.6, spanMm: 400, points: [{ massKg: 0.3, offsetMm: 150 }] });
    const K = [
      [3e5, 0, 0],
      [0, 2 * k, 0],
      [0, 0, 2 * k * 0.04],
    ];
    const M = [
      [mass.xKg, 0, 0],
      [0, mass.yKg, mass.couplingKgM],
      [0, mass.couplingKgM, mass.yawInertiaKgM2],
    ];
    const lib = (eigs(multiply(inv(M), K) as number[][]).values as number[]).map(Number).sort((a, b) => a - b);
    // Act
    const f = yawModeFrequencyHz({ stiffness, mass, halfSpanMm: 200 });
    // Assert: the off-centre carriage couples translation and yaw; the yaw-like mode is the highest of the three here
    expect((2 * Math.PI * f) ** 2 / lib[2]).toBeCloseTo(1, 8);
  });
});

describe('lowestModeMap', () => {
  it('when the belt mode is lowest at one corner and bending in the middle, then the map names each point by its own mode', () => {
    // Arrange
    const belt = [
      [50, 80],
      [80, 90],
    ];
    const bending = [
      [60, 60],
      [60, 60],
    ];
    // Act
    const r = lowestModeMap({ xMm: [0, 100], yMm: [0, 100], maps: { belt, 'gantry-bending': bending } });
    // Assert
    expect(r.lowest).toEqual({ frequencyHz: 50, modeId: 'belt', xMm: 0, yMm: 0 });
    expect(r.lowestModeId).toEqual([
      ['belt', 'gantry-bending'],
      ['gantry-bending', 'gantry-bending'],
    ]);
    expect(r.modes.map((m) => m.id)).toEqual(['belt', 'gantry-bending']);
  });
});
