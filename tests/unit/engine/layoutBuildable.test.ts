import { describe, expect, it } from 'vitest';
import { defaultDesign, evaluateDesign, frameToTravel, layoutDrawingAt, safeParseDesign, type DesignInput, type Mechanism } from '@/engine';
import { layoutViolations } from './helpers/layoutRules';
import { randomDesign, SEEDS } from './helpers/randomDesign';

const MECHS: Mechanism[] = ['corexy', 'hbot', 'cartesian'];
const FRACTIONS = [0, 0.25, 0.5, 0.75, 1];

/** Every violation of the buildability rules over a 5 × 5 grid of carriage positions covering the whole travel. */
function violationsOverTravel(d: DesignInput): string[] {
  const t = frameToTravel(d);
  const found = new Set<string>();
  for (const fx of FRACTIONS) {
    for (const fy of FRACTIONS) {
      const dr = layoutDrawingAt({ design: d, xMm: fx * t.xMm, yMm: fy * t.yMm });
      for (const v of layoutViolations(dr, d.belt.pitchMm)) found.add(`at (${fx}, ${fy}) of the travel: ${v}`);
    }
  }
  return [...found];
}

describe('layout buildability (independent geometric rules)', () => {
  it.each(MECHS)('when the %s template moves over its whole travel, then every rule holds', (mech) => {
    // Arrange
    const d = defaultDesign(mech);
    // Act
    const v = violationsOverTravel(d);
    // Assert
    expect(v).toEqual([]);
  });

  it.each(MECHS.flatMap((m) => SEEDS.map((s) => [m, s] as const)))(
    'when a random %s design (seed %i) moves over its whole travel, then every rule holds',
    (mech, seed) => {
      expect(violationsOverTravel(randomDesign(seed, mech))).toEqual([]);
    },
  );

  it.each(MECHS)('when the %s frame grows from small to large, then every valid size can be built as drawn', (mech) => {
    // Arrange: square and oblong frames from barely-valid to large, 20 mm and 40 mm profile.
    const base = defaultDesign(mech);
    let valid = 0;
    for (const outerX of [200, 260, 320, 460, 800, 1500]) {
      for (const ratio of [0.6, 1, 1.7]) {
        for (const extrusionMm of [20, 40]) {
          const r = safeParseDesign({
            ...base,
            frame: { ...base.frame, outerXMm: outerX, outerYMm: Math.round(outerX * ratio), extrusionMm },
          });
          if (!r.ok) continue;
          valid++;
          // Act + Assert
          expect(violationsOverTravel(r.value), `${outerX} × ${Math.round(outerX * ratio)}, ${extrusionMm} mm profile`).toEqual([]);
        }
      }
    }
    expect(valid).toBeGreaterThan(20);
  });

  it.each(MECHS)('when the %s result is drawn at parking, then the drawing itself passes the rules', (mech) => {
    const d = defaultDesign(mech);
    expect(layoutViolations(evaluateDesign(d).layout, d.belt.pitchMm)).toEqual([]);
  });

  it('when the crossed-belt pulleys were put back where the old layout had them, then the rules catch it', () => {
    // Arrange: the old layout's fault — motor A in the back-right corner and belt B's corner idler on the same axis.
    const d = defaultDesign('corexy');
    const dr = evaluateDesign(d).layout;
    const motorA = dr.parts.find((p) => p.id === 'A.motor')!;
    const moved = {
      ...dr,
      parts: dr.parts.map((p) => (p.id === 'B.frontRight' ? { ...p, xMm: motorA.xMm, yMm: motorA.yMm, stackedWith: [] } : p)),
    };
    // Act
    const v = layoutViolations(moved, d.belt.pitchMm);
    // Assert
    expect(v.some((x) => /share an axis without being stacked/.test(x))).toBe(true);
    expect(v.some((x) => /motor pulley shares an axis/.test(x))).toBe(true);
  });

  it('when the H belt passing run is drawn through the carriage as before, then the rules catch it', () => {
    const d = defaultDesign('hbot');
    const dr = evaluateDesign(d).layout;
    const cy = dr.carriage.yMm;
    const passing = (s: { y1Mm: number; y2Mm: number }) => Math.abs(s.y1Mm - s.y2Mm) < 1e-9 && s.y1Mm > cy + 1;
    const moved = {
      ...dr,
      belts: dr.belts.map((b) => ({ ...b, segments: b.segments.map((s) => (passing(s) ? { ...s, y1Mm: cy, y2Mm: cy } : s)) })),
    };
    expect(layoutViolations(moved, d.belt.pitchMm).some((x) => /runs through the carriage/.test(x))).toBe(true);
  });

  it('when two idlers on one level are pushed together, then the rules catch the overlap', () => {
    const d = defaultDesign('hbot');
    const dr = evaluateDesign(d).layout;
    const h1 = dr.parts.find((p) => p.id === 'H.gantryRightFront')!;
    const moved = {
      ...dr,
      parts: dr.parts.map((p) => (p.id === 'H.gantryRightBack' ? { ...p, xMm: h1.xMm, yMm: h1.yMm + 2 * h1.radiusMm } : p)),
    };
    expect(layoutViolations(moved, d.belt.pitchMm).some((x) => /overlap on level 1/.test(x))).toBe(true);
  });
});
