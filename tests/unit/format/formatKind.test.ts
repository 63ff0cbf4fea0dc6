/**
 * Engine quantity kinds shown in a unit system. Conversion factors: NIST SP 811 (2008) Appendix B.8 — 1 in = 25.4 mm
 * exactly, 1 lbf = 4.448 222 N.
 */
import { describe, expect, it } from 'vitest';
import { formatKind, kindLabel } from '@/format';

describe('formatKind', () => {
  it.each([
    // [value, kind, system, expected, why]
    [0.3, 'speedMPerS', 'metric', '300\u00a0mm/s', 'speeds read in mm/s like the value column (issue 13: "0.30 m/s" beside "300 mm/s")'],
    [0.3, 'speedMPerS', 'imperial', '11.8\u00a0in/s', '300 mm/s / 25.4 mm/in = 11.81 in/s (NIST SP 811 B.8)'],
    [0.02255, 'lengthMm', 'metric', '22.6\u00a0µm', 'a ringing amplitude reads in µm like its 20 µm tolerance'],
    [0.02, 'lengthMm', 'imperial', '0.787\u00a0thou', '0.02 mm / 0.0254 mm per thou'],
    [1234, 'lengthMm', 'metric', '1,234\u00a0mm', 'belt lengths keep whole millimetres'],
    [0.6, 'ratio', 'metric', '60\u00a0%', 'a share reads as a percentage (issue 13: 0.6 beside "60 %")'],
    [250, 'forceN', 'imperial', '56.2\u00a0lbf', '250 N / 4.448222 N per lbf (NIST SP 811 B.8)'],
    [45, 'angleDeg', 'metric', '45°', 'degrees close up to the number'],
  ] as const)('when %s %s is shown in %s, then it reads "%s" (%s)', (value, kind, system, expected, _source) => {
    expect(formatKind(value, kind, system)).toBe(expected);
  });

  it('when values are shown together, then they share one unit chosen from all of them', () => {
    // Arrange: a 0.5 mm value beside a 2 mm limit: both in mm, not µm beside mm
    const together = [0.5, 2];
    // Act
    const value = formatKind(0.5, 'lengthMm', 'metric', { together });
    const limit = formatKind(2, 'lengthMm', 'metric', { together });
    // Assert
    expect(value).toBe('0.5\u00a0mm');
    expect(limit).toBe('2\u00a0mm');
  });

  it('when the value is missing, then it reads as a dash', () => {
    expect(formatKind(null, 'forceN', 'metric')).toBe('—');
    expect(formatKind(Number.NaN, 'forceN', 'metric')).toBe('—');
  });
});

describe('kindLabel', () => {
  it('when a fine length is labelled, then the label follows the scale of the values', () => {
    expect(kindLabel('lengthMm', 'metric', [0.003])).toBe('µm');
    expect(kindLabel('lengthMm', 'metric', [12])).toBe('mm');
    expect(kindLabel('lengthMm', 'imperial', [12])).toBe('in');
  });
});
