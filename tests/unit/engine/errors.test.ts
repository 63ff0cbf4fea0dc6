import { describe, expect, it } from 'vitest';
import { EngineInputError, pitchDiameterMm, stepsPerMm } from '@/engine';

describe('EngineInputError', () => {
  it('when created with a scope, then the message carries the "[scope] what" prefix and the issues', () => {
    // Arrange / Act
    const err = new EngineInputError('parseDesign', 'belt.pitchMm: must be greater than 0', [
      { path: 'belt.pitchMm', message: 'must be greater than 0' },
    ]);
    // Assert
    expect(err.message).toBe('[parseDesign] belt.pitchMm: must be greater than 0');
    expect(err.scope).toBe('parseDesign');
    expect(err.issues).toEqual([{ path: 'belt.pitchMm', message: 'must be greater than 0' }]);
    expect(err).toBeInstanceOf(Error);
  });

  it('when created without issues, then one issue at the document root repeats the message', () => {
    const err = new EngineInputError('sweep', 'values must be a list');
    expect(err.issues).toEqual([{ path: '', message: 'values must be a list' }]);
  });

  it.each([
    ['pitchDiameterMm', () => pitchDiameterMm({ teeth: 0, pitchMm: 2 }), 'teeth'],
    ['pitchDiameterMm', () => pitchDiameterMm({ teeth: 20, pitchMm: Number.NaN }), 'pitchMm'],
    ['stepsPerMm', () => stepsPerMm({ fullStepsPerRev: 200, microsteps: -16, teeth: 20, pitchMm: 2 }), 'microsteps'],
  ])('when %s gets a bad argument, then it throws with the argument named', (scope, call, arg) => {
    try {
      call();
      expect.unreachable('should have thrown');
    } catch (e) {
      expect(e).toBeInstanceOf(EngineInputError);
      expect((e as EngineInputError).message.startsWith(`[${scope}]`)).toBe(true);
      expect((e as EngineInputError).issues[0].path).toBe(arg);
    }
  });
});
