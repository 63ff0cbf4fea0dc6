import { describe, expect, it } from 'vitest';
import { fieldLabel, fieldMessage, formatInputValue } from '@/format';

describe('fieldLabel', () => {
  it.each([
    ['frame.outerXMm', 'Frame width, outside (X)'],
    ['pulley.driveTeeth', 'Drive pulley'],
    ['motor.torqueCurve.2.speedRevPerS', 'Motor torque table, row 3, speed'],
    ['frictionN.z', 'Friction n z'],
  ])('when the path is %s, then the label is "%s"', (path, label) => {
    expect(fieldLabel(path)).toBe(label);
  });
});

describe('fieldMessage', () => {
  it.each([
    ['frame.outerXMm', 'outer X size must be greater than 0', 'Frame width, outside (X) must be greater than 0'],
    ['belt.pitchMm', 'is required', 'Belt pitch is required'],
    ['driver.microsteps', 'microsteps must be a power of two from 1 to 256', 'Microsteps must be a power of two from 1 to 256'],
    ['yMotors', 'two Y motors exist only in the cartesian mechanism', 'Y motors: two Y motors exist only in the cartesian mechanism'],
    ['', 'The file is not valid JSON.', 'The file is not valid JSON.'],
  ])('when the schema says "%s" at %s, then people read "%s"', (path, message, expected) => {
    expect(fieldMessage(path, message)).toBe(expected);
  });
});

describe('formatInputValue', () => {
  it.each([
    ['mechanism', 'hbot', 'metric', 'H-bot'],
    ['frame.outerXMm', 460, 'imperial', '18.11\u00a0in'],
    ['torqueMargin', 0.6, 'metric', '60\u00a0%'],
    ['ringingToleranceMm', 0.02, 'metric', '20\u00a0µm'],
    ['driver.microsteps', 16, 'metric', '1/16'],
    ['motorDirection.a', -1, 'metric', '−1 wired reversed'],
    ['wantedTravel', null, 'metric', '—'],
  ] as const)('when %s is %s in %s, then it reads "%s" (labels instead of codes, issue 13)', (path, value, system, expected) => {
    expect(formatInputValue(path, value, system)).toBe(expected);
  });
});
