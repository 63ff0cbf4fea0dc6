// The calculation CLI (scripts/calc.ts): user mistakes exit 2 with a clear message, never 1.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { ENGINE_VERSION, defaultDesign } from '@/engine';

const ROOT = fileURLToPath(new URL('../../../', import.meta.url));
const TSX = join(ROOT, 'node_modules', '.bin', 'tsx');
const dir = mkdtempSync(join(tmpdir(), 'calc-cli-'));

function run(...args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(TSX, ['scripts/calc.ts', ...args], { cwd: ROOT, encoding: 'utf8', timeout: 120_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function file(name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

describe('scripts/calc.ts', () => {
  it('when given a demo design, then it prints the result JSON and exits 0', () => {
    const r = run('reference/examples/corexy-dispensing-stage.json', '--compact');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.engineVersion).toBe(ENGINE_VERSION);
    expect(out.drive.stepsPerMm).toBeGreaterThan(0);
  }, 130_000);

  it.each([
    [
      'an invalid design',
      () => [file('bad.json', JSON.stringify({ ...defaultDesign('corexy'), driver: { microsteps: 3, supplyV: 24, currentRmsA: 1 } }))],
      /driver\.microsteps/,
    ],
    ['a file that is not JSON', () => [file('broken.json', '{ "name": ')], /not valid JSON/],
    ['a file that does not exist', () => [join(dir, 'missing.json')], /cannot read .*no such file/],
    ['no file', () => [], /no design file given/],
  ] as const)(
    'when given %s, then it exits 2 and says what is wrong on stderr',
    (_what, args, message) => {
      const r = run(...args());
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stdout).toBe('');
    },
    130_000,
  );
});

describe('scripts/calc.ts --job', () => {
  it('when a job CSV is given, then the result times those points on the design', () => {
    const csv = file('job.csv', 'x_mm,y_mm,dwell_s\n10,10,0.2\n120,60,0\n30,100,0.1\n');
    const r = run('reference/examples/corexy-dispensing-stage.json', '--job', csv, '--compact');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.job.moves).toHaveLength(2);
    expect(out.job.dwellS).toBeCloseTo(0.3, 12);
  }, 130_000);

  it('when the job CSV has a bad cell, then it exits 2 naming line and column', () => {
    const csv = file('badjob.csv', 'x,y\n1,2\nabc,3\n');
    const r = run('reference/examples/corexy-dispensing-stage.json', '--job', csv);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('line 3, x: "abc" is not a number');
  }, 130_000);
});
