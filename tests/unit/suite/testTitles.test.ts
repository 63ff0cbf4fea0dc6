import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { duplicateTitles, testFiles, testTitles } from './testTitles';

const TESTS_DIR = path.resolve(__dirname, '../..');

describe('test titles', () => {
  it('when every test file of the suite is read, then no two tests share a full describe > it title', () => {
    // Arrange
    const files = testFiles(TESTS_DIR);
    // Act
    const dupes = duplicateTitles(files.flatMap((f) => testTitles(f)));
    // Assert: listed with file and line, so a failure says what to rename
    const report = [...dupes].map(
      ([title, at]) => `${title}\n  ${at.map((t) => `${path.relative(TESTS_DIR, t.file)}:${t.line}`).join('\n  ')}`,
    );
    expect(files.length).toBeGreaterThan(100);
    expect(report).toEqual([]);
  }, 60_000);

  it('when two files repeat a nested title and one template title, then the scan finds both repeats and nothing else', () => {
    // Arrange: a hand-made pair of files with known repeats
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-titles-'));
    const body = [
      "describe('unit', () => {",
      "  it('when a, then b', () => {});",
      "  it.each([1, 2])('when %i, then c', () => {});",
      "  describe('inner', () => { it('when a, then b', () => {}); });",
      '});',
    ].join('\n');
    fs.writeFileSync(path.join(dir, 'one.test.ts'), body);
    fs.writeFileSync(path.join(dir, 'two.test.ts'), body.replace("'inner'", "'other'"));
    // Act
    const dupes = duplicateTitles(testFiles(dir).flatMap((f) => testTitles(f)));
    fs.rmSync(dir, { recursive: true, force: true });
    // Assert
    expect([...dupes.keys()].sort()).toEqual(['unit > when %i, then c', 'unit > when a, then b']);
    expect(dupes.get('unit > when a, then b')!.map((t) => t.line)).toEqual([2, 2]);
  });
});
