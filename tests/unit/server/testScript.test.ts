import { describe, expect, it } from 'vitest';
import { requiredPackages, selectedProjects, summarise, summaryLine, testPortOffset } from '../../../scripts/test';

describe('summarise + summaryLine (npm test final line)', () => {
  it('when tests passed and failed, then the line is "N passed, N failed"', () => {
    const counts = summarise({ numPassedTests: 41, numFailedTests: 2, numPendingTests: 0, numTodoTests: 0, testResults: [] });
    expect(summaryLine(counts)).toBe('41 passed, 2 failed');
  });

  it('when some were skipped or todo, then ", N skipped" is appended', () => {
    expect(summaryLine(summarise({ numPassedTests: 5, numFailedTests: 0, numPendingTests: 2, numTodoTests: 1 }))).toBe(
      '5 passed, 0 failed, 3 skipped',
    );
  });

  it('when a test file failed to load (no failed test inside), then it counts as one failure', () => {
    const counts = summarise({
      numPassedTests: 3,
      numFailedTests: 0,
      testResults: [
        { status: 'failed', message: 'Cannot find module', assertionResults: [] },
        { status: 'passed', assertionResults: [{ status: 'passed' }] },
      ],
    });
    expect(counts.failed).toBe(1);
  });
});

describe('selectedProjects and requiredPackages', () => {
  it('when no --project is given, then all four projects run and need MariaDB, chromium and poppler', () => {
    const projects = selectedProjects(['tests/api/auth.api.test.ts']);
    expect(projects).toEqual(['unit', 'client', 'api', 'e2e']);
    expect(requiredPackages(projects).map((p) => p.pkg)).toEqual(['mariadb-server', 'chromium', 'poppler-utils']);
  });

  it('when only unit and client are chosen (both spellings), then MariaDB and chromium are not required', () => {
    const projects = selectedProjects(['--project', 'unit', '--project=client']);
    expect(projects).toEqual(['unit', 'client']);
    expect(requiredPackages(projects).map((p) => p.pkg)).toEqual(['poppler-utils']);
  });

  it('when only api is chosen, then MariaDB is required but chromium is not', () => {
    expect(requiredPackages(selectedProjects(['--project', 'api'])).map((p) => p.pkg)).toEqual(['mariadb-server', 'poppler-utils']);
  });
});

describe('testPortOffset', () => {
  it('when GW_TEST_PORT_OFFSET is unset or empty, then the ports stay as documented (offset 0)', () => {
    expect(testPortOffset({})).toBe(0);
    expect(testPortOffset({ GW_TEST_PORT_OFFSET: '' })).toBe(0);
  });

  it('when it is a whole number, then every port moves by it', () => {
    expect(testPortOffset({ GW_TEST_PORT_OFFSET: '20' })).toBe(20);
  });

  it.each(['-1', '2.5', 'ten', '5000'])('when it is "%s", then the run stops naming the variable', (raw) => {
    expect(() => testPortOffset({ GW_TEST_PORT_OFFSET: raw })).toThrow(/GW_TEST_PORT_OFFSET/);
  });
});
