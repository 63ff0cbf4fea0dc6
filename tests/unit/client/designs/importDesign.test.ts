import { describe, expect, it } from 'vitest';
import { defaultDesign } from '@/engine';
import { parseDesignFile } from '@/views/designs/importDesign';

describe('parseDesignFile', () => {
  it('when the file is a valid exported design, then it is accepted with its defaults filled in', () => {
    // Arrange
    const { toolMount: _drop, ...doc } = defaultDesign('hbot');
    // Act
    const out = parseDesignFile(JSON.stringify(doc));
    // Assert
    expect(out.ok).toBe(true);
    if (out.ok) {
      expect(out.design.mechanism).toBe('hbot');
      expect(out.design.toolMount).toBeNull();
    }
  });

  it('when a number is out of range, then the problem names the field path', () => {
    const doc = defaultDesign('corexy');
    doc.driver.microsteps = 12;
    doc.masses.carriageKg = -1;
    const out = parseDesignFile(JSON.stringify(doc));
    expect(out.ok).toBe(false);
    if (!out.ok) {
      expect(out.issues.map((i) => i.path)).toEqual(expect.arrayContaining(['driver.microsteps', 'masses.carriageKg']));
      expect(out.issues.find((i) => i.path === 'masses.carriageKg')?.message).toBe('carriage mass must be greater than 0');
    }
  });

  it('when the file has a field the format does not know, then that field is named', () => {
    const doc = { ...defaultDesign('corexy'), frame: { ...defaultDesign('corexy').frame, colour: 'red' } };
    const out = parseDesignFile(JSON.stringify(doc));
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.issues).toContainEqual({ path: 'frame.colour', message: 'unknown field "colour"' });
  });

  it('when the file is not JSON, then it says so', () => {
    const out = parseDesignFile('{ mechanism: corexy');
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.issues[0].message).toMatch(/^The file is not valid JSON/);
  });

  it('when the file holds a list, then it asks for one design object', () => {
    const out = parseDesignFile('[1, 2]');
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.issues[0].message).toBe('The file must hold one design object, not a list or a single value.');
  });
});
