import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const CONTRACTS_DIR = fileURLToPath(new URL('../../../src/contracts/', import.meta.url));

/** Every .ts file below src/contracts, as paths relative to it. */
function contractFiles(): string[] {
  return readdirSync(CONTRACTS_DIR, { recursive: true, encoding: 'utf8' }).filter((f) => f.endsWith('.ts'));
}

describe('src/contracts', () => {
  it('when its sources are read, then they import only each other, zod, the engine and the formatting layer (no DOM, no Node)', () => {
    // Arrange
    const files = contractFiles();
    expect(files.length).toBeGreaterThan(10);
    expect(files).toContain('requests/designs.ts');
    for (const f of files) {
      // Act
      const src = readFileSync(CONTRACTS_DIR + f, 'utf8');
      const imports = [...src.matchAll(/^(?:import|export)\s[^;]*?from\s+'([^']+)'/gms)].map((m) => m[1]);
      // Assert
      for (const spec of imports) {
        const allowed = spec.startsWith('./') || spec.startsWith('../') || spec === 'zod' || spec === '@/engine' || spec === '@/format';
        expect(allowed, `${f} imports ${spec}`).toBe(true);
        if (spec.startsWith('../')) expect(f.includes('/'), `${f} reaches out of src/contracts with ${spec}`).toBe(true);
      }
      const code = src.replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '');
      expect(code, f).not.toMatch(/\b(console|process|window|document|localStorage|globalThis)\s*\.|Date\.now|Math\.random/);
    }
  });
});
