import { describe, expect, it } from 'vitest';
import type { Check } from '@/engine';
import { checkText, renderParts } from '@/format';

const cruise: Check = {
  id: 'cruise-speed',
  severity: 'warn',
  message: 'Cruise speed 0.30 m/s is reachable in every direction (worst 0.51 m/s).',
  parts: [
    'Cruise speed ',
    { value: 0.3, kind: 'speedMPerS' },
    ' is reachable in every direction (worst ',
    { value: 0.512, kind: 'speedMPerS' },
    ').',
  ],
  value: 0.3,
  limit: 0.512,
  unit: 'm/s',
  kind: 'speedMPerS',
  subject: null,
};

describe('renderParts', () => {
  it('when parts are rendered in metric, then text and quantities read in one unit', () => {
    expect(renderParts(cruise.parts!, 'metric')).toBe('Cruise speed 300\u00a0mm/s is reachable in every direction (worst 512\u00a0mm/s).');
  });

  it('when parts are rendered in imperial, then every quantity is in inches per second', () => {
    expect(renderParts(cruise.parts!, 'imperial')).toBe(
      'Cruise speed 11.8\u00a0in/s is reachable in every direction (worst 20.2\u00a0in/s).',
    );
  });
});

describe('checkText', () => {
  it('when a check has parts, then message, value and limit all read in the same unit (issue 13)', () => {
    // Act
    const text = checkText(cruise, 'metric');
    // Assert
    expect(text.message).toContain('300\u00a0mm/s');
    expect(text.value).toBe('300\u00a0mm/s');
    expect(text.limit).toBe('512\u00a0mm/s');
  });

  it('when an older check has no parts or kind, then its message stays and its unit string picks the kind', () => {
    // Arrange
    const older = {
      id: 'belt-working-tension:A',
      severity: 'ok',
      message: 'Belt A: tight side 80 N.',
      value: 80,
      limit: 250,
      unit: 'N',
    } as Check;
    // Act
    const text = checkText(older, 'imperial');
    // Assert
    expect(text.message).toBe('Belt A: tight side 80 N.');
    expect(text.value).toBe('18\u00a0lbf');
    expect(text.limit).toBe('56.2\u00a0lbf');
  });

  it('when an older torque-margin check is shown, then its share reads as a percentage', () => {
    const margin = { id: 'torque-margin', severity: 'ok', message: 'The design uses 60 %.', value: 0.6, limit: 0.7, unit: '' } as Check;
    expect(checkText(margin, 'metric')).toMatchObject({ value: '60\u00a0%', limit: '70\u00a0%' });
  });
});
