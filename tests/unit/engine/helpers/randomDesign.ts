/**
 * Seeded random valid designs for the engine's property tests. A small PRNG (mulberry32) keeps every run
 * identical, so a failing case can be reproduced from its seed.
 */
import { defaultDesign, parseDesign, type DesignInput, type Mechanism } from '@/engine';

/** mulberry32: a tiny 32-bit PRNG, good enough to spread test cases. */
export function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * A random, valid design of a mechanism.
 * @param seed - PRNG seed
 * @param mechanism - mechanism key
 * @param opts.square - same outer X and Y
 * @returns a validated design (small stiffness map to keep tests quick)
 */
export function randomDesign(seed: number, mechanism: Mechanism, opts: { square?: boolean } = {}): DesignInput {
  const r = prng(seed);
  const between = (a: number, b: number) => a + (b - a) * r();
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)];
  const base = defaultDesign(mechanism);
  const outerX = Math.round(between(350, 900));
  const teeth = pick([16, 20, 24, 30, 36]);
  const rated = between(1, 2.5);
  return parseDesign({
    ...base,
    name: `random ${mechanism} ${seed}`,
    yMotors: mechanism === 'cartesian' ? pick([1, 2] as const) : 1,
    frame: {
      outerXMm: outerX,
      outerYMm: opts.square ? outerX : Math.round(between(350, 900)),
      extrusionMm: pick([15, 20, 30, 40]),
      carriageXMm: between(40, 90),
      carriageYMm: between(40, 80),
      gantryYMm: between(30, 60),
      clearanceMm: between(2, 10),
    },
    belt: {
      ...base.belt,
      pitchMm: pick([2, 3]),
      widthMm: pick([6, 9]),
      linearMassKgPerM: between(0.004, 0.02),
      axialStiffnessN: between(2e4, 1e5),
    },
    pulley: { driveTeeth: teeth, idlerTeeth: pick([16, 20, 24]), driveInertiaKgM2: null, idlerInertiaKgM2: null },
    motor: {
      ...base.motor,
      stepAngleDeg: pick([0.9, 1.8]),
      holdingTorqueNm: between(0.2, 0.9),
      ratedCurrentA: rated,
      phaseResistanceOhm: between(0.8, 3),
      phaseInductanceMh: between(1, 6),
      rotorInertiaKgM2: between(3e-6, 1.5e-5),
      massKg: between(0.2, 0.5),
    },
    driver: { microsteps: pick([8, 16, 32, 64]), supplyV: pick([12, 24, 36, 48]), currentRmsA: rated * between(0.5, 1) },
    masses: { carriageKg: between(0.1, 1), toolKg: between(0, 0.5), gantryKg: between(0.2, 1.2) },
    frictionN: { x: between(0, 4), y: between(0, 6) },
    pretensionN: between(20, 80),
    torqueMargin: between(0.4, 0.8),
    cruiseSpeedMmPerS: between(50, 400),
    map: { points: 11 },
  });
}

/** Seeds used by the property tests. */
export const SEEDS: number[] = Array.from({ length: 12 }, (_, i) => 1000 + 17 * i);

/**
 * A random design document over nearly the whole range the schema allows (it may be invalid, e.g. a frame too
 * small for its carriage): for robustness tests that every valid design evaluates to finite numbers.
 * @param seed - PRNG seed
 * @returns an unvalidated design document
 */
export function wideRandomDocument(seed: number): Record<string, unknown> {
  const r = prng(seed);
  const b = (a: number, c: number) => a + (c - a) * r();
  const pick = <T>(x: readonly T[]): T => x[Math.floor(r() * x.length)];
  const mech = pick(['corexy', 'hbot', 'cartesian'] as Mechanism[]);
  const base = defaultDesign(mech);
  return {
    ...base,
    frame: {
      outerXMm: b(100, 3000),
      outerYMm: b(100, 3000),
      extrusionMm: b(5, 80),
      carriageXMm: b(5, 300),
      carriageYMm: b(5, 300),
      gantryYMm: b(5, 200),
      clearanceMm: b(0, 50),
    },
    belt: {
      ...base.belt,
      pitchMm: pick([1, 2, 3, 5, 8, 14]),
      linearMassKgPerM: b(0.001, 0.5),
      axialStiffnessN: b(100, 1e7),
      allowableTensionN: b(1, 1e4),
    },
    pulley: { ...base.pulley, driveTeeth: Math.round(b(6, 80)), idlerTeeth: Math.round(b(6, 80)) },
    motor: {
      ...base.motor,
      stepAngleDeg: pick([0.9, 1.8, 3.6, 7.5, 15, b(0.1, 15)]),
      holdingTorqueNm: b(0.001, 20),
      ratedCurrentA: b(0.1, 10),
      phaseResistanceOhm: pick([0, b(0, 50)]),
      phaseInductanceMh: pick([0, b(0, 100)]),
      rotorInertiaKgM2: pick([0, b(0, 1e-3)]),
      massKg: b(0, 10),
      torqueCurve:
        r() < 0.3
          ? [
              { speedRevPerS: 0, torqueNm: b(0.01, 2) },
              { speedRevPerS: b(0.1, 50), torqueNm: b(0, 2) },
            ]
          : null,
      maxSpeedRevPerS: r() < 0.2 ? b(0.1, 50) : null,
    },
    driver: { microsteps: pick([1, 4, 256]), supplyV: b(1, 200), currentRmsA: b(0.05, 10) },
    masses: { carriageKg: b(0.001, 50), toolKg: pick([0, b(0, 20)]), gantryKg: pick([0, b(0, 50)]) },
    frictionN: { x: pick([0, b(0, 500)]), y: pick([0, b(0, 500)]) },
    pretensionN: b(0.1, 2000),
    torqueMargin: b(0.01, 1),
    cruiseSpeedMmPerS: b(1, 5000),
    toolMount: r() < 0.5 ? { holdN: b(0.01, 1000) } : null,
    map: { points: Math.round(b(2, 12)) },
    plannedAccelMmPerS2: r() < 0.5 ? b(1, 1e5) : null,
    yMotors: mech === 'cartesian' ? pick([1, 2]) : 1,
  };
}
