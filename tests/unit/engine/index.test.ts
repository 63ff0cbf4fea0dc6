import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import * as engine from '@/engine';

const ENGINE_DIR = fileURLToPath(new URL('../../../src/engine/', import.meta.url));

describe('engine entry point (src/engine/index.ts)', () => {
  it.each([
    'pitchDiameterMm',
    'stepsPerMm',
    'carriageToMotor',
    'motorToCarriage',
    'openBeltLengthMm',
    'wrapAngleRad',
    'spanFrequencyHz',
    'tensionFromFrequencyN',
    'reflectedMassKg',
    'naturalFrequencyHz',
    'motorTorqueNm',
    'pullOutTorqueNm',
    'beltArmTensionsN',
    'moveTimeS',
    'evaluateDesign',
    'compareMechanisms',
    'sweep',
    'parseDesign',
    'safeParseDesign',
    'defaultDesign',
    'travelToFrame',
  ])('when %s is looked up, then the entry point exports it as a function (the named functions of src/engine/README.md)', (name) => {
    expect(typeof (engine as Record<string, unknown>)[name]).toBe('function');
  });

  it('when ENGINE_VERSION and the schema are looked up, then they are exported', () => {
    expect(engine.ENGINE_VERSION).toMatch(/^\d+\.\d+\.\d+$/);
    expect(typeof engine.designInputSchema.safeParse).toBe('function');
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
