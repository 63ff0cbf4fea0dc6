import { describe, expect, it } from 'vitest';
import { getAt, nonGroupStep, setAt } from '@/engine';

describe('getAt', () => {
  it('when a nested field is read by its dotted path, then its value comes back', () => {
    expect(getAt({ pulley: { driveTeeth: 20 } }, 'pulley.driveTeeth')).toBe(20);
  });

  it('when a step of the path is missing or not an object, then the value is undefined', () => {
    expect(getAt({ pulley: null }, 'pulley.driveTeeth')).toBeUndefined();
    expect(getAt({ pretensionN: 30 }, 'pretensionN.x')).toBeUndefined();
  });
});

describe('setAt', () => {
  it('when a value is written under a missing group, then the group is created and the value set in place', () => {
    // Arrange
    const doc: Record<string, unknown> = { belt: { pitchMm: 2 } };
    // Act
    setAt(doc, 'toolMount.holdN', 40);
    setAt(doc, 'belt.pitchMm', 3);
    // Assert
    expect(doc).toEqual({ belt: { pitchMm: 3 }, toolMount: { holdN: 40 } });
  });

  it.each(['__proto__.polluted', 'constructor.prototype.polluted'])(
    'when the path is %s, then it throws and no prototype changes',
    (path) => {
      expect(() => setAt({}, path, 1)).toThrow(/not a field path/);
      expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    },
  );
});

describe('nonGroupStep', () => {
  it('when the path goes through a number, then that step is named; through groups or missing ones, null', () => {
    expect(nonGroupStep({ pretensionN: 30 }, 'pretensionN.x')).toBe('pretensionN');
    expect(nonGroupStep({ a: { b: [1] } }, 'a.b.c')).toBe('a.b');
    expect(nonGroupStep({ a: { b: 1 } }, 'a.b')).toBeNull();
    expect(nonGroupStep({}, 'a.b')).toBeNull();
  });
});
