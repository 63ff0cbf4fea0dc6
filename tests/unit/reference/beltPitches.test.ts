/**
 * Belt pitches (ISO 5296, DIN 7721, ISO 13050, 2/3 mm desktop practice) and pulley pitch diameters
 * against the engine's pitchDiameterMm. Sources and provenance: reference/README.md.
 */
import { describe, expect, it } from 'vitest';
import { create, all } from 'mathjs';
import { pitchDiameterMm } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

const math = create(all);

type PitchDiameterInputs = Parameters<typeof pitchDiameterMm>[0];

const iso5296 = loadReference<{ pitchIn: number }, { pitchMm: number }>('iso-5296', 'pitches');
const metricTables = [
  loadReference<PitchDiameterInputs, { pitchMm: number; pitchDiameterMm: number }>('din-7721', 'pitches'),
  loadReference<PitchDiameterInputs, { pitchMm: number; pitchDiameterMm: number }>('iso-13050', 'pitches'),
  loadReference<PitchDiameterInputs, { pitchMm: number; pitchDiameterMm: number }>('desktop-belt-practice', 'pitches'),
];
const pitchDiameters = loadReference<PitchDiameterInputs, { pitchDiameterMm: number; pitchDiameterIn?: number }>('pulley-pitch-circle', 'pitch-diameters');

/** Tooth count used to carry an inch-table pitch through the engine. */
const CHECK_TEETH = 20;

describe('ISO 5296 inch pitches', () => {
  const cases = referenceCases(iso5296);

  it.each(cases)('when %s is converted with mathjs units, then it equals the table\'s mm pitch', (_title, row) => {
    // Arrange
    const pitch = math.unit(row.inputs.pitchIn, 'in');
    // Act
    const pitchMm = pitch.toNumber('mm');
    // Assert
    expectWithinTolerance(pitchMm, row.expected.pitchMm, row.tolerance, `${row.id} pitchMm`);
  });

  it.each(cases)('when %s drives a 20-tooth pulley, then pitchDiameterMm puts 20 pitches on its pitch circle', (_title, row) => {
    // Arrange
    const input = { teeth: CHECK_TEETH, pitchMm: row.expected.pitchMm };
    // Act
    const diameterMm = pitchDiameterMm(input);
    // Assert: pitch circumference π·d carries z pitches (d = z·p/π).
    expectWithinTolerance((Math.PI * diameterMm) / CHECK_TEETH, row.expected.pitchMm, row.tolerance, `${row.id} circumference / z`);
  });
});

describe.each(metricTables.map((table) => [table.source.shortName, table] as const))('%s metric pitches', (_name, table) => {
  const cases = referenceCases(table);

  it.each(cases)('when %s drives its pulley, then pitchDiameterMm gives the pitch circle of that pitch', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const diameterMm = pitchDiameterMm(input);
    // Assert
    expect(row.inputs.pitchMm, `${row.id}: row pitch must be the published pitch`).toBe(row.expected.pitchMm);
    expectWithinTolerance(diameterMm, row.expected.pitchDiameterMm, row.tolerance, `${row.id} pitchDiameterMm`);
  });
});

describe('pitchDiameterMm', () => {
  const cases = referenceCases(pitchDiameters);

  it.each(cases)('when %s, then the engine gives the tabulated pitch diameter', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const diameterMm = pitchDiameterMm(input);
    // Assert
    expectWithinTolerance(diameterMm, row.expected.pitchDiameterMm, row.tolerance, `${row.id} pitchDiameterMm`);
    if (row.expected.pitchDiameterIn !== undefined) {
      const diameterIn = math.unit(diameterMm, 'mm').toNumber('in');
      expectWithinTolerance(diameterIn, row.expected.pitchDiameterIn, row.tolerance, `${row.id} pitchDiameterIn`);
    }
  });

  it.each(cases)('when %s names its profile, then its pitch is that profile\'s published pitch', (_title, row) => {
    // Arrange
    const published = new Map<string, number>();
    for (const r of iso5296.rows) published.set(r.profile ?? '', r.expected.pitchMm);
    for (const table of metricTables) for (const r of table.rows) published.set(r.profile ?? '', r.expected.pitchMm);
    // Act
    const pitchMm = published.get(row.profile ?? '');
    // Assert
    expect(pitchMm, `${row.id}: profile "${row.profile}" is in no published pitch table`).toBeDefined();
    expect(row.inputs.pitchMm).toBe(pitchMm);
  });
});
