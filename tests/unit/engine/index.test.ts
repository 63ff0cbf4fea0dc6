import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import * as engine from '@/engine';

const ENGINE_DIR = fileURLToPath(new URL('../../../src/engine/', import.meta.url));

describe('engine entry point (src/engine/index.ts)', () => {
  // Each named function is checked against published values in its own file; the type checker already fails the
  // build when one goes missing from the entry point, so no "is it a function" test here.
  it('when ENGINE_VERSION is read, then it is a semantic version (stored with every result)', () => {
    expect(engine.ENGINE_VERSION).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it('when the engine sources are read, then none imports a framework, the platform or another part of the app', () => {
    const files = readdirSync(ENGINE_DIR).filter((f) => f.endsWith('.ts'));
    expect(files.length).toBeGreaterThan(10);
    for (const f of files) {
      const src = readFileSync(ENGINE_DIR + f, 'utf8');
      const imports = [...src.matchAll(/from\s+'([^']+)'/g)].map((m) => m[1]);
      for (const spec of imports) {
        expect(spec === 'zod' || spec.startsWith('./'), `${f} imports ${spec}`).toBe(true);
      }
      expect(src, f).not.toMatch(/\b(console|process|window|document|globalThis)\s*\.|Date\.now|Math\.random/);
    }
  });
});
