import { describe, expect, it } from 'vitest';
import { formatSignificant, renderQuantity } from '@/engine';

describe('formatSignificant', () => {
  it.each([
    [1234.4, '1234'],
    [12.34, '12.3'],
    [0.012345, '0.0123'],
    [-6, '−6'],
    [0, '0'],
  ])('when %d is written, then it reads %s', (v, text) => {
    expect(formatSignificant(v)).toBe(text);
  });
});

describe('renderQuantity', () => {
  it.each([
    [{ value: 0.6, kind: 'ratio' }, '60 %'],
    [{ value: 269.4, kind: 'angleDeg' }, '269°'],
    [{ value: 4.8, kind: 'forceN' }, '4.8 N'],
    [{ value: 6.7, kind: 'momentNm' }, '6.7 N·m'],
    [{ value: 5, kind: 'count' }, '5'],
  ] as const)('when %j is rendered, then it reads %s in metric', (q, text) => {
    expect(renderQuantity(q)).toBe(text);
  });
});
