import { create, createUnitDependencies, multiplyDependencies, unitDependencies } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { CsvError, parseTorqueCsv, TORQUE_CSV_LIMITS, torqueCsvUnitFactor, type CsvErrorDetail } from '../../../../server/uploads';
import { expectWithinTolerance, loadReference, referenceCases } from '../../../helpers/loadReference';

function csvErrorOf(text: string): CsvError {
  try {
    parseTorqueCsv(text);
  } catch (err) {
    if (err instanceof CsvError) return err;
    throw err;
  }
  throw new Error('expected a CsvError, but the table parsed');
}

describe('parseTorqueCsv', () => {
  describe('header spellings', () => {
    // [header, speed unit, torque unit]
    const cases: Array<[string, string, string]> = [
      ['speed_rpm,torque_Ncm', 'rpm', 'N·cm'],
      ['speed (rev/s), torque (oz·in)', 'rev/s', 'oz·in'],
      ['Speed [rps],Torque [N.m]', 'rev/s', 'N·m'],
      ['speed_rev/s,torque_Nm', 'rev/s', 'N·m'],
      ['speed (r/min),torque (N·m)', 'rpm', 'N·m'],
      ['rpm,ozin', 'rpm', 'oz·in'],
      ['speed rpm,torque oz-in', 'rpm', 'oz·in'],
      ['SPEED_RPM,TORQUE_NCM', 'rpm', 'N·cm'],
      ['Speed (1/min),Pull-out torque (N cm)', 'rpm', 'N·cm'],
      ['speed (rev/s),torque (oz in)', 'rev/s', 'oz·in'],
      ['speed (rev/min),torque (N⋅m)', 'rpm', 'N·m'],
    ];

    it.each(cases)('when the header is "%s", then the units are %s and %s', (header, speedUnit, torqueUnit) => {
      // Arrange
      const text = `${header}\n0,1\n1,1\n2,1\n`;
      // Act
      const table = parseTorqueCsv(text);
      // Assert
      expect(table.sourceUnits).toEqual({ speed: speedUnit, torque: torqueUnit });
      expect(table.points).toHaveLength(3);
    });

    it('when the torque column comes first, then the columns are still read by their units', () => {
      // Arrange
      const text = 'torque_Ncm,speed_rpm\n40,0\n38,60\n30,120\n';
      // Act
      const table = parseTorqueCsv(text);
      // Assert
      expect(table.points).toEqual([
        { speedRevPerS: 0, torqueNm: 0.4 },
        { speedRevPerS: 1, torqueNm: 0.38 },
        { speedRevPerS: 2, torqueNm: 0.3 },
      ]);
    });
  });

  describe('unit conversion', () => {
    it('when speeds are in rpm and torques in N·cm, then points come back in rev/s (÷ 60) and N·m (÷ 100)', () => {
      // Arrange
      const text = 'speed_rpm,torque_Ncm\n0,45\n300,42\n600,36\n1500,20\n';
      // Act
      const { points } = parseTorqueCsv(text);
      // Assert
      const expected = [
        [0, 0.45],
        [5, 0.42],
        [10, 0.36],
        [25, 0.2],
      ];
      points.forEach((p, i) => {
        expect(p.speedRevPerS).toBeCloseTo(expected[i][0], 12);
        expect(p.torqueNm).toBeCloseTo(expected[i][1], 12);
      });
    });

    const factors = loadReference<{ value: number; fromUnit: string; toUnit: string }, { factor: number }>(
      'nist-sp811',
      'conversion-factors',
    );
    const ozIn = factors.rows.filter((r) => r.id === 'NIST-OZFIN');

    it.each(referenceCases(factors, ozIn))('when the torque is in oz·in, then the factor to N·m is %s', (_title, row) => {
      // Arrange / Act
      const factor = torqueCsvUnitFactor('oz·in');
      // Assert
      expectWithinTolerance(factor, row.expected.factor, row.tolerance, `${row.id} oz·in → N·m`);
    });

    const conversions = loadReference<{ value: number; fromUnit: string; toUnit: string }, { converted: number }>(
      'nist-sp811',
      'conversions',
    );
    const ozInWorked = conversions.rows.filter((r) => r.id === 'CONV-OZFIN');

    it.each(referenceCases(conversions, ozInWorked))(
      'when a table holds the %s torque, then its point carries the published N·m',
      (_title, row) => {
        // Arrange
        const text = `speed (rev/s), torque (oz·in)\n0,${row.inputs.value}\n1,50\n2,40\n`;
        // Act
        const { points } = parseTorqueCsv(text);
        // Assert
        expectWithinTolerance(points[0].torqueNm, row.expected.converted, row.tolerance, `${row.id} ${row.inputs.value} oz·in`);
      },
    );

    it.each([
      ['rev/s', 1],
      ['rpm', 1 / 60],
      ['N·m', 1],
      ['N·cm', 0.01],
    ] as const)('when the unit is %s, then the factor is %s', (unit, factor) => {
      // Arrange / Act / Assert
      expect(torqueCsvUnitFactor(unit)).toBeCloseTo(factor, 15);
    });

    it.each([
      ['rev/s', '1 rps', 'rps'],
      ['rpm', '1 rpm', 'rps'],
      ['N·m', '1 N m', 'N m'],
      ['N·cm', '1 N cm', 'N m'],
      ['oz·in', '1 ozf in', 'N m'],
    ] as const)('when the unit is %s, then the factor is exactly mathjs’s %s in %s (library)', (unit, quantity, target) => {
      // Arrange: a private mathjs instance; ozf from its definition (1 oz avoirdupois × standard gravity)
      const math = create({ unitDependencies, createUnitDependencies, multiplyDependencies });
      math.createUnit('ozf', { definition: math.multiply(math.unit(0.028349523125, 'kg'), math.unit(9.80665, 'm/s^2')) as never });
      math.createUnit('rps', '1 / s');
      math.createUnit('rpm', '1 / min');
      // Act
      const expected = math.unit(quantity).toNumber(target);
      // Assert
      expect(torqueCsvUnitFactor(unit)).toBe(expected);
    });
  });

  describe('file conventions', () => {
    it('when the file has a BOM, CRLF line ends, blank lines, # comments, spaces and quotes, then all points are read', () => {
      // Arrange
      const text =
        '\uFEFF# motor 17HS19 (invented)\r\nspeed_rpm , torque_Ncm\r\n\r\n"0", "40"\r\n  60 ,38\r\n# mid-table note\r\n\r\n120,30\r\n';
      // Act
      const { points } = parseTorqueCsv(text);
      // Assert
      expect(points.map((p) => p.speedRevPerS)).toEqual([0, 1, 2]);
    });

    it('when the file is semicolon-separated with decimal commas, then the numbers are read', () => {
      // Arrange
      const text = 'Speed [rpm];Torque [N.m]\n0;0,45\n300;0,40\n600;0,3\n';
      // Act
      const { points } = parseTorqueCsv(text);
      // Assert
      expect(points.map((p) => p.torqueNm)).toEqual([0.45, 0.4, 0.3]);
    });

    it('when the file is tab-separated, then the numbers are read', () => {
      // Arrange
      const text = 'rpm\tNcm\n0\t40\n60\t38,5\n120\t30\n';
      // Act
      const { points } = parseTorqueCsv(text);
      // Assert
      expect(points.map((p) => p.torqueNm)).toEqual([0.4, 0.385, 0.3]);
    });

    it('when a row ends with a trailing separator, then the empty last cell is ignored', () => {
      // Arrange
      const text = 'speed_rpm,torque_Ncm,\n0,40,\n60,38,\n120,30,\n';
      // Act / Assert
      expect(parseTorqueCsv(text).points).toHaveLength(3);
    });

    it(`when the table has exactly ${TORQUE_CSV_LIMITS.maxPoints} points, then it is accepted`, () => {
      // Arrange
      const rows = Array.from({ length: TORQUE_CSV_LIMITS.maxPoints }, (_, i) => `${i * 10},${40 - i * 0.05}`);
      // Act
      const { points } = parseTorqueCsv(`speed_rpm,torque_Ncm\n${rows.join('\n')}\n`);
      // Assert
      expect(points).toHaveLength(500);
    });
  });

  describe('errors name line and column', () => {
    // [case, text, expected first detail]
    const cases: Array<[string, string, CsvErrorDetail]> = [
      [
        'speed going down',
        'speed_rpm,torque_Ncm\n0,40\n60,38\n50,30\n',
        { line: 4, column: 'speed_rpm', message: 'speed must increase from row to row: 50 rpm follows 60 rpm on line 3' },
      ],
      [
        'a repeated speed',
        'speed_rpm,torque_Ncm\n0,40\n60,38\n60,30\n',
        { line: 4, column: 'speed_rpm', message: 'speed must increase from row to row: 60 rpm follows 60 rpm on line 3' },
      ],
      [
        'negative torque',
        'speed_rpm,torque_Ncm\n0,40\n60,-1\n120,30\n',
        { line: 3, column: 'torque_Ncm', message: 'torque must not be negative (found -1)' },
      ],
      [
        'negative speed',
        'speed_rpm,torque_Ncm\n-60,40\n0,38\n120,30\n',
        { line: 2, column: 'speed_rpm', message: 'speed must not be negative (found -60)' },
      ],
      [
        'text in a number cell',
        'speed_rpm,torque_Ncm\n0,40\n60,abc\n120,30\n',
        { line: 3, column: 'torque_Ncm', message: '"abc" is not a number' },
      ],
      [
        'a number with a unit in its cell',
        'speed (rev/s),torque (N·m)\n0,0.4\n1 rps,0.38\n2,0.3\n',
        { line: 3, column: 'speed (rev/s)', message: '"1 rps" is not a number' },
      ],
      [
        'an overflowing number',
        'speed_rpm,torque_Ncm\n0,40\n60,1e999\n120,30\n',
        { line: 3, column: 'torque_Ncm', message: '"1e999" is not a number' },
      ],
      [
        'an empty cell',
        'speed_rpm,torque_Ncm\n0,40\n60,""\n120,30\n',
        { line: 3, column: 'torque_Ncm', message: 'empty cell; a number is needed' },
      ],
      [
        'a row with three values',
        'speed_rpm,torque_Ncm\n0,40\n60,38,1\n120,30\n',
        { line: 3, column: null, message: 'expected 2 values (speed_rpm, torque_Ncm), found 3' },
      ],
      [
        'a bad row after blank and comment lines',
        'speed_rpm,torque_Ncm\n\n# note\n0,40\n\n60,x\n120,30\n',
        { line: 6, column: 'torque_Ncm', message: '"x" is not a number' },
      ],
      [
        'two points only',
        'speed_rpm,torque_Ncm\n0,40\n60,38\n',
        { line: null, column: null, message: 'at least 3 points are needed to draw a curve, found 2' },
      ],
      [
        'a header only',
        'speed_rpm,torque_Ncm\n',
        { line: null, column: null, message: 'at least 3 points are needed to draw a curve, found 0' },
      ],
      [
        'an unclosed quote',
        'speed_rpm,torque_Ncm\n0,40\n"60,38\n120,30\n',
        { line: 4, column: null, message: 'a quote (") is opened but never closed' },
      ],
    ];

    it.each(cases)('when the table has %s, then CsvError names where', (_name, text, expected) => {
      // Arrange / Act
      const error = csvErrorOf(text);
      // Assert
      expect(error.details[0]).toEqual(expected);
      expect(error.httpStatus).toBe(400);
      expect(error.code).toBe('invalid_csv');
    });

    // [case, text, column, message fragment]
    const headerCases: Array<[string, string, string | null, RegExp]> = [
      [
        'an unknown torque unit',
        'speed_rpm,torque_kgcm\n0,1\n1,1\n2,1\n',
        'torque_kgcm',
        /unknown unit "kgcm"; use rev\/s, rps or rpm for speed and N·m, N·cm or oz·in/,
      ],
      [
        'a step rate instead of a speed',
        'speed_pps,torque_Ncm\n0,1\n1,1\n2,1\n',
        'speed_pps',
        /step or pulse rates depend on the step angle/,
      ],
      ['no units', 'speed,torque\n0,1\n1,1\n2,1\n', 'speed', /no unit given/],
      ['two speed columns', 'speed_rpm,speed_rps\n0,1\n1,1\n2,1\n', 'speed_rps', /both columns are speeds/],
      ['a torque label on a speed unit', 'torque_rpm,torque_Ncm\n0,1\n1,1\n2,1\n', 'torque_rpm', /says torque but its unit rpm is a speed/],
      ['three columns', 'speed_rpm,torque_Ncm,current_A\n0,1,1\n', null, /header must name 2 columns.*found 3/],
    ];

    it.each(headerCases)('when the header has %s, then CsvError points at line 1', (_name, text, column, message) => {
      // Arrange / Act
      const error = csvErrorOf(text);
      // Assert
      expect(error.details[0].line).toBe(1);
      expect(error.details[0].column).toBe(column);
      expect(error.details[0].message).toMatch(message);
    });

    it.each([
      ['empty', ''],
      ['blank lines only', '\n\n  \n'],
      ['a BOM only', '\uFEFF'],
    ])('when the file is %s, then CsvError asks for a header', (_name, text) => {
      // Arrange / Act
      const error = csvErrorOf(text);
      // Assert
      expect(error.details).toEqual([{ line: null, column: null, message: expect.stringMatching(/the file is empty/) }]);
    });

    it('when several rows are wrong, then every problem is listed with its line', () => {
      // Arrange
      const text = 'speed_rpm,torque_Ncm\n0,40\n60,abc\n50,-3\n120,30\n';
      // Act
      const error = csvErrorOf(text);
      // Assert
      expect(error.details.map((d) => [d.line, d.column])).toEqual([
        [3, 'torque_Ncm'],
        [4, 'torque_Ncm'],
      ]);
      expect(error.message).toBe('The torque table cannot be used: line 3, torque_Ncm: "abc" is not a number (and 1 more problem)');
    });

    it('when a table has hundreds of bad rows, then at most 20 are listed', () => {
      // Arrange
      const rows = Array.from({ length: 300 }, (_, i) => `${i},bad`);
      // Act
      const error = csvErrorOf(`speed_rpm,torque_Ncm\n${rows.join('\n')}\n`);
      // Assert
      expect(error.details).toHaveLength(20);
      expect(error.details[19].line).toBe(21);
    });

    it(`when the table has ${TORQUE_CSV_LIMITS.maxPoints + 1} points, then CsvError names the first line over the limit`, () => {
      // Arrange
      const rows = Array.from({ length: TORQUE_CSV_LIMITS.maxPoints + 1 }, (_, i) => `${i * 10},40`);
      // Act
      const error = csvErrorOf(`speed_rpm,torque_Ncm\n${rows.join('\n')}\n`);
      // Assert
      expect(error.details).toEqual([{ line: 502, column: null, message: 'too many rows; at most 500 points are accepted' }]);
    });
  });
});
