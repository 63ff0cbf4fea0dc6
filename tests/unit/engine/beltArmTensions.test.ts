import { describe, expect, it } from 'vitest';
import { beltArmTensionsN, chainTensionChangesN, EngineInputError } from '@/engine';
import { springChainN } from './helpers/springChain';

describe('beltArmTensionsN', () => {
  it.each([
    // Hand values: tight = T₀ + F·L₂/L, slack = T₀ − F·L₁/L
    [40, 26, 500, 500, 53, 27],
    [15, 21, 900, 100, 17.1, -3.9],
    [15, 21, 100, 900, 33.9, 12.9],
  ])(
    'when pretension %d N carries %d N with arms %d mm (pulled) and %d mm, then tight %d N and slack %d N',
    (t0, f, l1, l2, tight, slack) => {
      // Arrange / Act
      const r = beltArmTensionsN({ pretensionN: t0, pullN: f, pullArmMm: l1, otherArmMm: l2 });
      // Assert
      expect(r.tightN).toBeCloseTo(tight, 12);
      expect(r.slackN).toBeCloseTo(slack, 12);
    },
  );

  it.each([
    [900, 100],
    [250, 750],
    [37, 1663],
  ])('when the arms are %d and %d mm, then the two-spring solution gives the same tensions (independent)', (l1, l2) => {
    // Arrange
    const [d1, d2] = springChainN([l1, l2], [30]);
    // Act
    const r = beltArmTensionsN({ pretensionN: 40, pullN: 30, pullArmMm: l1, otherArmMm: l2 });
    // Assert
    expect(r.tightN).toBeCloseTo(40 + d1, 9);
    expect(r.slackN).toBeCloseTo(40 + d2, 9);
  });

  it('when the arms have no length at all, then it refuses naming the arms', () => {
    expect(() => beltArmTensionsN({ pretensionN: 40, pullN: 30, pullArmMm: 0, otherArmMm: 0 })).toThrow(EngineInputError);
  });
});

describe('chainTensionChangesN', () => {
  it.each([
    [
      [400, 700, 400],
      [12, -7],
    ],
    [
      [60, 1400, 900],
      [25, 25],
    ],
    [
      [1200, 80, 30, 500],
      [5, -20, 8],
    ],
  ])('when a chain %j carries pulls %j, then the spring network gives the same piece tensions (independent)', (lengths, pulls) => {
    // Arrange
    const expected = springChainN(lengths, pulls);
    // Act
    const changes = chainTensionChangesN(lengths, pulls);
    // Assert
    changes.forEach((c, i) => expect(c).toBeCloseTo(expected[i], 9));
  });

  it('when a chain carries pulls, then the loop keeps its length and each pulley is balanced', () => {
    // Arrange
    const lengths = [300, 1100, 450];
    const pulls = [18, -4];
    // Act
    const d = chainTensionChangesN(lengths, pulls);
    // Assert: Σ ΔTᵢ·Lᵢ = 0 and T_k − T_{k+1} = F_k
    expect(d.reduce((s, t, i) => s + t * lengths[i], 0)).toBeCloseTo(0, 9);
    expect(d[0] - d[1]).toBeCloseTo(18, 12);
    expect(d[1] - d[2]).toBeCloseTo(-4, 12);
  });
});
