import { describe, expect, it } from 'vitest';
import { CsvError, JOB_CSV_LIMITS, parseJobCsv } from '../../../../server/uploads';

function csvErrorOf(text: string): CsvError {
  try {
    parseJobCsv(text);
  } catch (err) {
    if (err instanceof CsvError) return err;
    throw err;
  }
  throw new Error('expected a CsvError, but the job parsed');
}

describe('parseJobCsv', () => {
  it.each([
    ['x_mm,y_mm,dwell_s', { x: 'mm', y: 'mm', dwell: 's' }],
    ['x (mm), y (mm), dwell (ms)', { x: 'mm', y: 'mm', dwell: 'ms' }],
    ['X [in];Y [in]', { x: 'in', y: 'in', dwell: null }],
    ['x,y', { x: 'mm', y: 'mm', dwell: null }],
    ['dwell time (s),y position (mm),x position (mm)', { x: 'mm', y: 'mm', dwell: 's' }],
    ['x,y,pause_ms', { x: 'mm', y: 'mm', dwell: 'ms' }],
  ])('when the header is "%s", then the units are %j', (header, units) => {
    // Arrange
    const sep = header.includes(';') ? ';' : ',';
    const row = header
      .split(sep)
      .map(() => '1')
      .join(sep);
    // Act
    const table = parseJobCsv(`${header}\n${row}\n${row}\n`);
    // Assert
    expect(table.sourceUnits).toEqual(units);
    expect(table.points).toHaveLength(2);
  });

  it('when points are in inches and dwells in ms, then they come back in mm (× 25.4 exactly, NIST SP 811) and s', () => {
    // Act
    const table = parseJobCsv('x_in,y_in,dwell_ms\n1,2,250\n0.1,3.5,0\n');
    // Assert
    expect(table.points).toEqual([
      { xMm: 25.4, yMm: 50.8, dwellS: 0.25 },
      { xMm: 2.54, yMm: 88.9, dwellS: 0 },
    ]);
  });

  it('when the columns come in another order with a semicolon, decimal commas, a BOM, comments and blank lines, then the points are read', () => {
    // Arrange
    const text = '\uFEFF# placer job\r\ndwell_s;y_mm;x_mm\r\n0,2;10,5;20\r\n\r\n# second\r\n;11;21\r\n';
    // Act
    const table = parseJobCsv(text);
    // Assert
    expect(table.points).toEqual([
      { xMm: 20, yMm: 10.5, dwellS: 0.2 },
      { xMm: 21, yMm: 11, dwellS: 0 },
    ]);
  });

  it('when a row is missing its dwell, then it has none', () => {
    expect(parseJobCsv('x,y,dwell\n1,2\n3,4,0.5\n').points).toEqual([
      { xMm: 1, yMm: 2, dwellS: 0 },
      { xMm: 3, yMm: 4, dwellS: 0.5 },
    ]);
  });

  it('when cells are not numbers, negative dwells or too far, then every problem names its line and column', () => {
    // Arrange
    const text = 'x_mm,y_mm,dwell_s\n1,2,0\nten,2,0\n1,2,-1\n20000,2,0\n1,2,3,4\n';
    // Act
    const err = csvErrorOf(text);
    // Assert
    expect(err.details).toEqual([
      { line: 3, column: 'x_mm', message: '"ten" is not a number' },
      { line: 4, column: 'dwell_s', message: 'dwell must be between 0 and 3600 s (found -1)' },
      { line: 5, column: 'x_mm', message: 'x must be within ±10000 mm (found 20000 mm)' },
      { line: 6, column: null, message: 'expected 3 values (x_mm, y_mm, dwell_s), found 4' },
    ]);
    expect(err.message).toMatch(/^The job file cannot be used: line 3, x_mm: "ten" is not a number \(and 3 more problems\)$/);
    expect(err.httpStatus).toBe(400);
  });

  it.each([
    ['1,2\n3,4\n', 'the first line must be a header naming the columns'],
    ['x,z\n1,2\n', 'unknown column "z"'],
    ['x_ft,y\n1,2\n', 'unknown length unit "ft"'],
    ['x,y,dwell_min\n1,2,3\n', 'unknown time unit "min"'],
    ['x,x,y\n1,2,3\n', 'the x column appears twice'],
    ['x,dwell\n1,2\n', 'the header has no y column'],
    ['x,y\n', 'the file has a header but no points'],
    ['', 'the file is empty'],
    ['x,y\n"1,2\n', 'a quote (") is opened but never closed'],
  ])('when the file is %j, then it is refused with "%s"', (text, message) => {
    expect(csvErrorOf(text).details[0].message).toContain(message);
  });

  it('when the file has more points than a job holds, then it says how many are allowed', () => {
    // Arrange
    const rows = Array.from({ length: JOB_CSV_LIMITS.maxPoints + 1 }, (_, i) => `${i % 300},${i % 200}`).join('\n');
    // Act
    const err = csvErrorOf(`x,y\n${rows}\n`);
    // Assert
    expect(err.details[0]).toEqual({
      line: JOB_CSV_LIMITS.maxPoints + 2,
      column: null,
      message: 'too many rows; a job holds at most 1000 points',
    });
  });

  it('when exactly the allowed number of points is given, then all are read', () => {
    const rows = Array.from({ length: JOB_CSV_LIMITS.maxPoints }, (_, i) => `${i % 300},${i % 200}`).join('\n');
    expect(parseJobCsv(`x,y\n${rows}\n`).points).toHaveLength(JOB_CSV_LIMITS.maxPoints);
  });
});
