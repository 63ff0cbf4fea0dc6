import type { DesignResult } from '@/engine';

/** Top-level sections of an engine result a client may ask for (POST /api/calc `sections`). */
export const RESULT_SECTIONS = [
  'kinematics',
  'signConvention',
  'motors',
  'drive',
  'travel',
  'parking',
  'mass',
  'envelope',
  'coupling',
  'torqueSpeed',
  'belts',
  'stiffness',
  'errorBudget',
  'modes',
  'modesNotHeld',
  'structure',
  'shaping',
  'excitation',
  'heat',
  'loads',
  'job',
  'racking',
  'layout',
  'partsList',
  'checks',
  'cautions',
] as const satisfies readonly (keyof DesignResult)[];

/** One section name. */
export type ResultSection = (typeof RESULT_SECTIONS)[number];

/** Identification the answer always carries, whatever was asked. */
const ALWAYS = ['engineVersion', 'mechanism', 'name'] as const;

/**
 * The result with only the asked sections (plus engine version, mechanism and name); all of it when none are
 * named. A full result with a 41-point map is about 100 kB of JSON; the checks alone are a few kB.
 * @param result - a full engine result
 * @param sections - sections wanted, or undefined for everything
 */
export function pickSections(result: DesignResult, sections?: readonly ResultSection[]): Partial<DesignResult> {
  if (!sections) return result;
  const out: Record<string, unknown> = {};
  for (const key of ALWAYS) out[key] = result[key];
  for (const key of sections) out[key] = result[key];
  return out as Partial<DesignResult>;
}
