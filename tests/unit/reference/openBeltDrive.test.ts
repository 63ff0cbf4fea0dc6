/**
 * Open two-pulley drive: approximate belt length (Shigley 17-16a, from memory), its inverse (17-16b),
 * the exact length of Encyclopaedia Britannica 1911 Eq. (32 B) (seen), small-pulley wrap angle
 * (Shigley 17-1, from memory) and teeth in mesh (belt makers' practice). Provenance: reference/README.md.
 */
import { describe, expect, it } from 'vitest';
import { openBeltLengthExactMm, openBeltLengthMm, teethInMesh as engineTeethInMesh, teethInMeshFactor, wrapAngleRad } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

type DriveInputs = Parameters<typeof openBeltLengthMm>[0];

const approxLength = loadReference<DriveInputs, { lengthMm: number }>('shigley-mechanical-engineering-design', 'open-belt-length');
const exactLength = loadReference<DriveInputs, { lengthMm: number }>('britannica-1911', 'open-belt-length-exact');
const wrap = loadReference<DriveInputs, { wrapAngleRad: number; wrapAngleDeg: number }>('shigley-mechanical-engineering-design', 'wrap-angle');
const teethInMesh = loadReference<DriveInputs & { teeth: number }, { teethInMesh: number; fullTeethInMesh: number; capacityFactor: number }>(
  'belt-maker-practice',
  'teeth-in-mesh',
);

/**
 * Exact open-belt length, Encyclopaedia Britannica 11th ed. (1911), "Mechanics" §59, Eq. (32 B):
 * L = 2√(c² − (r₁ − r₂)²) + π(r₁ + r₂) + 2(r₁ − r₂)·asin((r₁ − r₂)/c), r₁ ≥ r₂.
 */
function exactOpenBeltLengthMm({ centerMm, d1Mm, d2Mm }: DriveInputs): number {
  const r1 = Math.max(d1Mm, d2Mm) / 2;
  const r2 = Math.min(d1Mm, d2Mm) / 2;
  return 2 * Math.sqrt(centerMm ** 2 - (r1 - r2) ** 2) + Math.PI * (r1 + r2) + 2 * (r1 - r2) * Math.asin((r1 - r2) / centerMm);
}

/** Teeth in full contact; the epsilon absorbs rounding when the wrap puts a tooth exactly at the edge. */
const FULL_TOOTH_EPSILON = 1e-9;

describe('openBeltLengthMm', () => {
  const cases = referenceCases(approxLength);

  it.each(cases)('when %s, then the engine gives the approximate pitch length', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const lengthMm = openBeltLengthMm(input);
    // Assert
    expectWithinTolerance(lengthMm, row.expected.lengthMm, row.tolerance, `${row.id} lengthMm`);
  });

  const exactCases = referenceCases(exactLength);

  it.each(exactCases)('when %s is recomputed from Eq. (32 B) in the test, then it matches the stored exact length', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const exactMm = exactOpenBeltLengthMm(input);
    // Assert: values are stored to 10 significant figures.
    expectWithinTolerance(exactMm, row.expected.lengthMm, { rel: 1e-9 }, `${row.id} exact lengthMm`);
  });

  it.each(exactCases)('when %s, then the engine\'s exact-length function gives the stored exact length', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const exactMm = openBeltLengthExactMm(input);
    // Assert
    expectWithinTolerance(exactMm, row.expected.lengthMm, { rel: 1e-9 }, `${row.id} openBeltLengthExactMm`);
  });

  it.each(exactCases)('when %s, then the engine\'s approximate length falls short of the exact length by no more than the stated tolerance', (_title, row) => {
    // Arrange
    const exactMm = exactOpenBeltLengthMm(row.inputs);
    // Act
    const approxMm = openBeltLengthMm(row.inputs);
    // Assert: the series of the exact form only adds positive terms, so the approximation never overshoots.
    expect(approxMm, `${row.id}: approximation must not exceed the exact length`).toBeLessThanOrEqual(exactMm + 1e-9);
    expectWithinTolerance(approxMm, exactMm, row.tolerance, `${row.id} approximate vs exact`);
  });
});

describe('wrapAngleRad', () => {
  const cases = referenceCases(wrap);

  it.each(cases)('when %s, then the engine gives the small pulley\'s wrap angle', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const angleRad = wrapAngleRad(input);
    // Assert
    expectWithinTolerance(angleRad, row.expected.wrapAngleRad, row.tolerance, `${row.id} wrapAngleRad`);
    expectWithinTolerance((angleRad * 180) / Math.PI, row.expected.wrapAngleDeg, row.tolerance, `${row.id} wrapAngleDeg`);
  });
});

describe('teeth in mesh from wrapAngleRad', () => {
  const cases = referenceCases(teethInMesh);

  it.each(cases)('when %s, then the engine\'s teeth in mesh, full teeth and capacity factor match the rule', (_title, row) => {
    // Arrange
    const { teeth, ...drive } = row.inputs;
    // Act
    const tim = engineTeethInMesh({ teeth, wrapRad: wrapAngleRad(drive) });
    const fullTeeth = Math.floor(tim + FULL_TOOTH_EPSILON);
    const capacityFactor = teethInMeshFactor(tim);
    // Assert
    expectWithinTolerance(tim, row.expected.teethInMesh, row.tolerance, `${row.id} teethInMesh`);
    expect(fullTeeth, `${row.id} fullTeethInMesh`).toBe(row.expected.fullTeethInMesh);
    expectWithinTolerance(capacityFactor, row.expected.capacityFactor, { abs: 1e-12 }, `${row.id} capacityFactor`);
  });
});
