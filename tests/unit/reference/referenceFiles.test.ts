/**
 * The reference tables themselves: every file parses with a complete citation and an honest status, and
 * reference/README.md indexes every one of them with that status.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { REFERENCE_DIR, REFERENCE_STATUSES, listReferenceTables, loadReference } from '../../helpers/loadReference';

/** reference/examples holds the demo designs (invented numbers), not published data. */
const NOT_PUBLISHED = ['examples'] as const;

const tables = listReferenceTables(NOT_PUBLISHED).map((path) => [path, ...path.split('/')] as [path: string, slug: string, table: string]);
const readme = readFileSync(join(REFERENCE_DIR, 'README.md'), 'utf8');

describe('reference tables', () => {
  it('when the reference folder is listed, then it holds published tables', () => {
    // Arrange / Act
    const count = tables.length;
    // Assert
    expect(count).toBeGreaterThanOrEqual(20);
  });

  it.each(tables)('when %s is loaded, then it has a full citation, units and uniquely named rows', (_path, slug, table) => {
    // Arrange / Act
    const loaded = loadReference(slug, table);
    // Assert
    expect(REFERENCE_STATUSES).toContain(loaded.source.status);
    expect(Object.keys(loaded.units).length).toBeGreaterThan(0);
    expect(new Set(loaded.rows.map((r) => r.id)).size).toBe(loaded.rows.length);
  });

  it.each(tables)('when %s is looked up in reference/README.md, then its index line names the source and its status', (path, slug, table) => {
    // Arrange
    const loaded = loadReference(slug, table);
    // Act
    const line = readme.split('\n').find((l) => l.includes(`\`${path}.json\``));
    // Assert
    expect(line, `${path}.json is not indexed in reference/README.md`).toBeDefined();
    expect(line).toContain(loaded.source.status);
    expect(line).toContain(loaded.source.shortName);
  });

  const withOwnStatus = tables
    .map(([path, slug, table]) => {
      const loaded = loadReference(slug, table);
      const rows = loaded.rows.filter((r) => r.status !== undefined && r.status !== loaded.source.status).map((r) => ({ id: r.id, status: r.status as string }));
      return [path, rows] as [path: string, rows: { id: string; status: string }[]];
    })
    .filter(([, rows]) => rows.length > 0);

  it.each(withOwnStatus)('when %s has rows with their own status, then its README index line names each of them with that status', (path, rows) => {
    // Arrange
    const line = readme.split('\n').find((l) => l.includes(`\`${path}.json\``)) ?? '';
    // Act
    const missing = rows.filter((r) => !line.includes(`${r.id} (${r.status})`)).map((r) => r.id);
    // Assert
    expect(missing, `not named on the index line of ${path}.json`).toEqual([]);
  });
});
