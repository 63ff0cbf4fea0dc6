import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const FORMAT_DIR = fileURLToPath(new URL('../../../src/format/', import.meta.url));
const ENGINE_DIR = fileURLToPath(new URL('../../../src/engine/', import.meta.url));

describe('src/format', () => {
  it('when its sources are read, then they import only each other, mathjs and the engine’s and the contract’s types (no DOM, no Node)', () => {
    // Arrange
    const files = readdirSync(FORMAT_DIR).filter((f) => f.endsWith('.ts'));
    expect(files.length).toBeGreaterThan(5);
    for (const f of files) {
      // Act
      const src = readFileSync(FORMAT_DIR + f, 'utf8');
      const imports = [...src.matchAll(/^import\s+(type\s+)?[^;]*?from\s+'([^']+)'/gms)].map((m) => ({ isType: !!m[1], spec: m[2] }));
      // Assert
      for (const { isType, spec } of imports) {
        const allowed = spec.startsWith('./') || spec === 'mathjs' || ((spec === '@/engine' || spec === '@/contracts') && isType);
        expect(allowed, `${f} imports ${spec}`).toBe(true);
      }
      expect(src, f).not.toMatch(/\b(window|document|process|localStorage)\s*\./);
    }
  });

  it('when the engine sources are read, then none imports the formatting layer', () => {
    for (const f of readdirSync(ENGINE_DIR).filter((n) => n.endsWith('.ts'))) {
      expect(readFileSync(ENGINE_DIR + f, 'utf8'), f).not.toMatch(/from\s+'(@\/format|\.\.\/format)/);
    }
  });
});
