import { describe, expect, it } from 'vitest';
import {
  beltPullsToForce,
  carriageToMotor,
  couplingShares,
  forceToBeltPulls,
  inverse2,
  kinematicsMatrix,
  motorToCarriage,
  multiply2,
  type Mechanism,
  type MotorDirection,
} from '@/engine';
import { prng } from './helpers/randomDesign';

const MECHS: Mechanism[] = ['corexy', 'hbot', 'cartesian'];
const DIRS: MotorDirection[] = [
  { a: 1, b: 1 },
  { a: -1, b: 1 },
  { a: 1, b: -1 },
  { a: -1, b: -1 },
];

describe('kinematicsMatrix', () => {
  it.each([
    // source: I. Moyer, CoreXY (corexy.com, 2012), inverse relation ΔA = ΔX + ΔY, ΔB = ΔX − ΔY (confirmed via MIT 865.15 class page)
    [
      'corexy',
      [
        [1, 1],
        [1, -1],
      ],
      'CoreXY 2012',
    ],
    // source: same relation for the H layout (RepRap wiki "CoreXY": H-bot is the same parallel arrangement)
    [
      'hbot',
      [
        [1, 1],
        [1, -1],
      ],
      'CoreXY 2012 / RepRap wiki',
    ],
    [
      'cartesian',
      [
        [1, 0],
        [0, 1],
      ],
      'one motor per axis (definition)',
    ],
  ] as const)('when the mechanism is %s, then K is %j (%s)', (mech, expected, _source) => {
    expect(kinematicsMatrix(mech)).toEqual(expected);
  });

  it('when motor B is wired the other way, then only its row flips', () => {
    expect(kinematicsMatrix('corexy', { a: 1, b: -1 })).toEqual([
      [1, 1],
      [-1, 1],
    ]);
  });

  it('when an unknown mechanism is given, then it throws naming the mechanism', () => {
    expect(() => kinematicsMatrix('delta' as Mechanism)).toThrow(/\[kinematicsMatrix\] mechanism/);
  });

  // Property: K·K⁻¹ = I for every mechanism and sign convention.
  it.each(MECHS.flatMap((m) => DIRS.map((d) => [m, d] as const)))(
    'when K of %s %j is multiplied by its inverse, then it gives the identity',
    (mech, dir) => {
      const k = kinematicsMatrix(mech, dir);
      const i = multiply2(k, inverse2(k));
      expect(i[0][0]).toBeCloseTo(1, 12);
      expect(i[0][1]).toBeCloseTo(0, 12);
      expect(i[1][0]).toBeCloseTo(0, 12);
      expect(i[1][1]).toBeCloseTo(1, 12);
    },
  );
});

describe('carriageToMotor', () => {
  it.each([
    // source: CoreXY 2012 (CXY-INV): ΔX = 30, ΔY = −10 → ΔA = 20, ΔB = 40
    ['corexy', 30, -10, 20, 40],
    // source: CoreXY 2012 (CXY-PURE-X): a pure X move needs the same belt at both motors
    ['corexy', 100, 0, 100, 100],
    ['hbot', 30, -10, 20, 40],
    ['cartesian', 30, -10, 30, -10],
  ] as const)('when %s moves by (%d, %d) mm, then the belts move (%d, %d) mm', (mechanism, dx, dy, da, db) => {
    const r = carriageToMotor({ mechanism, dxMm: dx, dyMm: dy });
    expect(r.daMm).toBeCloseTo(da, 12);
    expect(r.dbMm).toBeCloseTo(db, 12);
  });
});

describe('motorToCarriage', () => {
  it.each([
    // source: CoreXY 2012 and Wikipedia "CoreXY": one motor alone moves the carriage diagonally, ΔA/√2 at 45°
    ['corexy', 10, 0, 5, 5],
    ['corexy', 0, 10, 5, -5],
    ['hbot', 10, 0, 5, 5],
    ['cartesian', 10, 0, 10, 0],
  ] as const)('when %s motors move (%d, %d) mm of belt, then the carriage moves (%d, %d) mm', (mechanism, da, db, dx, dy) => {
    const r = motorToCarriage({ mechanism, daMm: da, dbMm: db });
    expect(r.dxMm).toBeCloseTo(dx, 12);
    expect(r.dyMm).toBeCloseTo(dy, 12);
  });

  it('when one crossed-belt motor turns alone, then the carriage travels ΔA/√2 along 45° (CoreXY 2012, CXY-FWD-A-ONLY)', () => {
    const r = motorToCarriage({ mechanism: 'corexy', daMm: 10, dbMm: 0 });
    expect(Math.hypot(r.dxMm, r.dyMm)).toBeCloseTo(10 / Math.SQRT2, 10);
    expect((Math.atan2(r.dyMm, r.dxMm) * 180) / Math.PI).toBeCloseTo(45, 10);
  });

  it.each(MECHS)('when a %s move goes to the motors and back, then it returns unchanged', (mechanism) => {
    const r = prng(7);
    for (let i = 0; i < 20; i++) {
      const dx = (r() - 0.5) * 400;
      const dy = (r() - 0.5) * 400;
      const m = carriageToMotor({ mechanism, dxMm: dx, dyMm: dy, motorDirection: { a: -1, b: 1 } });
      const c = motorToCarriage({ mechanism, daMm: m.daMm, dbMm: m.dbMm, motorDirection: { a: -1, b: 1 } });
      expect(c.dxMm).toBeCloseTo(dx, 9);
      expect(c.dyMm).toBeCloseTo(dy, 9);
    }
  });
});

describe('beltPullsToForce', () => {
  it('when both crossed-belt motors pull 10 N, then the carriage gets 20 N along X (derived by virtual work, CXY-FORCE)', () => {
    const f = beltPullsToForce({ mechanism: 'corexy', forceAN: 10, forceBN: 10 });
    expect(f.forceXN).toBeCloseTo(20, 12);
    expect(f.forceYN).toBeCloseTo(0, 12);
  });

  // Property: power balance FA·vA + FB·vB = Fx·vx + Fy·vy (virtual work, docs/models/envelope.md §1).
  it.each(MECHS.flatMap((m) => DIRS.map((d) => [m, d] as const)))(
    'when %s %j carries random pulls and speeds, then motor power equals carriage power',
    (mechanism, motorDirection) => {
      const r = prng(mechanism.length * 31 + motorDirection.a + 3 * motorDirection.b);
      for (let i = 0; i < 25; i++) {
        const fa = (r() - 0.5) * 100;
        const fb = (r() - 0.5) * 100;
        const vx = (r() - 0.5) * 2;
        const vy = (r() - 0.5) * 2;
        const f = beltPullsToForce({ mechanism, forceAN: fa, forceBN: fb, motorDirection });
        const v = carriageToMotor({ mechanism, dxMm: vx, dyMm: vy, motorDirection });
        expect(fa * v.daMm + fb * v.dbMm).toBeCloseTo(f.forceXN * vx + f.forceYN * vy, 9);
      }
    },
  );
});

describe('forceToBeltPulls', () => {
  it.each(MECHS)('when a %s carriage force is turned into pulls and back, then it returns unchanged', (mechanism) => {
    const p = forceToBeltPulls({ mechanism, forceXN: 12, forceYN: -7 });
    const f = beltPullsToForce({ mechanism, forceAN: p.forceAN, forceBN: p.forceBN });
    expect(f.forceXN).toBeCloseTo(12, 12);
    expect(f.forceYN).toBeCloseTo(-7, 12);
  });
});

describe('couplingShares', () => {
  it.each([
    // A diagonal move of length s needs √2·s of belt from one motor (CoreXY 2012, CXY-INV-DIAG)
    ['corexy', 45, Math.SQRT2, 0, 1 / Math.SQRT2, 0],
    ['corexy', 0, 1, 1, 0.5, 0.5],
    ['corexy', 90, 1, -1, 0.5, -0.5],
    ['cartesian', 90, 0, 1, 0, 1],
  ] as const)('when %s moves along %d°, then speed shares are (%d, %d) and force shares (%d, %d)', (mech, deg, sa, sb, fa, fb) => {
    const s = couplingShares(kinematicsMatrix(mech), (deg * Math.PI) / 180);
    expect(s.speedA).toBeCloseTo(sa, 12);
    expect(s.speedB).toBeCloseTo(sb, 12);
    expect(s.forceA).toBeCloseTo(fa, 12);
    expect(s.forceB).toBeCloseTo(fb, 12);
  });

  it.each(MECHS)('when %s shares are taken over a full turn, then speed × force shares sum to one (power balance)', (mech) => {
    const k = kinematicsMatrix(mech, { a: -1, b: 1 });
    for (let deg = 0; deg < 360; deg += 7) {
      const s = couplingShares(k, (deg * Math.PI) / 180);
      expect(s.speedA * s.forceA + s.speedB * s.forceB).toBeCloseTo(1, 12);
    }
  });
});
