/**
 * The reference tables themselves: every file parses with a complete citation, every row carries one of the four
 * labels (a derived row names its equation), and reference/README.md indexes every file with its labels.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { REFERENCE_DIR, REFERENCE_LABELS, listReferenceTables, loadReference } from '../../helpers/loadReference';

/** reference/examples holds the demo designs (invented numbers), not reference data. */
const NOT_REFERENCE = ['examples'] as const;

const tables = listReferenceTables(NOT_REFERENCE).map((path) => [path, ...path.split('/')] as [path: string, slug: string, table: string]);
const readme = readFileSync(join(REFERENCE_DIR, 'README.md'), 'utf8');

describe('reference tables', () => {
  it('when the reference folder is listed, then it holds the reference tables', () => {
    // Arrange / Act
    const count = tables.length;
    // Assert
    expect(count).toBeGreaterThanOrEqual(20);
  });

  it.each(tables)('when %s is loaded, then it has a full citation, units, uniquely named rows and a label on every row', (_path, slug, table) => {
    // Arrange / Act
    const loaded = loadReference(slug, table);
    // Assert
    expect(Object.keys(loaded.units).length).toBeGreaterThan(0);
    expect(new Set(loaded.rows.map((r) => r.id)).size).toBe(loaded.rows.length);
    for (const row of loaded.rows) {
      expect(REFERENCE_LABELS, row.id).toContain(row.label);
      if (row.label === 'derived') expect(row.equation, `${row.id} names no equation`).toBeTruthy();
    }
  });

  it.each(tables)('when %s is looked up in reference/README.md, then its index line names the source and every label its rows carry', (path, slug, table) => {
    // Arrange
    const loaded = loadReference(slug, table);
    // Act
    const line = readme.split('\n').find((l) => l.includes(`\`${path}.json\``));
    // Assert
    expect(line, `${path}.json is not indexed in reference/README.md`).toBeDefined();
    expect(line).toContain(loaded.source.shortName);
    for (const label of new Set(loaded.rows.map((r) => r.label))) expect(line).toContain(label);
  });

  it('when the reference data is searched for the old motor model, then no row expects zero torque above V/k_e', () => {
    // Arrange
    const rows = tables.flatMap(([, slug, table]) => loadReference(slug, table).rows);
    // Act
    const ceiling = rows.filter((r) => JSON.stringify(r).includes('torqueNm') && (r.expected as { torqueNm?: number }).torqueNm === 0);
    // Assert
    expect(ceiling.map((r) => r.id)).toEqual([]);
  });
});
