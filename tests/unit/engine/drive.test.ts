import { describe, expect, it } from 'vitest';
import { fullStepsPerRev, pitchDiameterMm, reflectedMassKg, rotorTeeth, stepsPerMm, travelPerRevMm } from '@/engine';

describe('pitchDiameterMm', () => {
  it.each([
    // d = z·p/π; pitches: ISO 5296 (MXL 2.032 mm), DIN 7721 (T5), ISO 13050:2014/2022 (3 mm), 2 mm belts (common practice)
    [20, 2.032, 12.9361, 'ISO 5296 MXL'],
    [16, 5, 25.4648, 'DIN 7721 T5'],
    [20, 3, 19.0986, 'ISO 13050 H3M'],
    [20, 2, 12.7324, '2 mm belt, common practice'],
    [16, 2, 10.1859, '2 mm belt, common practice'],
  ])('when %i teeth at %d mm pitch, then the pitch diameter is %d mm (%s)', (teeth, pitchMm, expected) => {
    expect(pitchDiameterMm({ teeth, pitchMm })).toBeCloseTo(expected, 3);
  });
});

describe('travelPerRevMm', () => {
  it.each([
    [20, 2, 40],
    [36, 3, 108],
  ])('when %i teeth at %d mm pitch, then one turn feeds %d mm of belt', (teeth, pitchMm, expected) => {
    expect(travelPerRevMm({ teeth, pitchMm })).toBeCloseTo(expected, 12);
  });
});

describe('stepsPerMm', () => {
  it.each([
    // common practice (public printer-firmware discussion): 80 steps/mm for 200 × 16 over 20T × 2 mm
    [200, 16, 20, 2, 80],
    [400, 16, 16, 2, 200],
    [200, 16, 20, 2.032, 78.7402],
    [200, 16, 20, 2.5, 64],
  ])(
    'when %i full steps × %i microsteps drive %i teeth of %d mm, then steps/mm is %d (common practice)',
    (full, micro, teeth, pitchMm, expected) => {
      expect(stepsPerMm({ fullStepsPerRev: full, microsteps: micro, teeth, pitchMm })).toBeCloseTo(expected, 4);
    },
  );
});

describe('reflectedMassKg', () => {
  it.each([
    // Linear Motion Tips (Design World), belt and pulley inertia: m_eq = J/r², r = z·p/(2π)
    [5.7e-6, 20, 2, 0.140642],
    [5.7e-6, 16, 2, 0.219753],
  ])(
    'when J = %d kg·m² on %i teeth of %d mm, then the belt-line mass is %d kg (Linear Motion Tips)',
    (inertiaKgM2, teeth, pitchMm, expected) => {
      expect(reflectedMassKg({ inertiaKgM2, teeth, pitchMm })).toBeCloseTo(expected, 5);
    },
  );
});

describe('fullStepsPerRev', () => {
  it.each([
    [1.8, 200],
    [0.9, 400],
  ])('when the step angle is %d°, then there are %i full steps per turn', (deg, expected) => {
    expect(fullStepsPerRev(deg)).toBeCloseTo(expected, 9);
  });
});

describe('rotorTeeth', () => {
  it.each([
    // motor manufacturer FAQ: a 1.8° two-phase hybrid has 50 rotor teeth (50·4 = 200 steps)
    [1.8, 50],
    [0.9, 100],
  ])('when the step angle is %d°, then the rotor has %i teeth', (deg, expected) => {
    expect(rotorTeeth(deg)).toBeCloseTo(expected, 9);
  });
});
