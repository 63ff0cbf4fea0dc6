import { z } from 'zod';
import { designDocumentSchema } from './designs.schema';
import { RESULT_SECTIONS } from '../workers/sections';

/**
 * POST /api/calc {design, sections?}: issues are named "design.<field>". `sections` names the top-level parts of
 * the result wanted (e.g. ["drive", "checks"]); without it the whole result comes back.
 */
export const calcSchema = z.strictObject({
  design: designDocumentSchema,
  sections: z
    .array(z.enum(RESULT_SECTIONS, { message: `must be one of ${RESULT_SECTIONS.join(', ')}` }), {
      message: 'must be a list of result section names',
    })
    .min(1, 'must name at least 1 section (leave it out for the whole result)')
    .max(RESULT_SECTIONS.length, `must have at most ${RESULT_SECTIONS.length} entries`)
    .optional(),
});

/** POST /api/calc/compare {design}. */
export const compareSchema = z.strictObject({ design: designDocumentSchema });

/** Most values a sweep may take in one request (each value is one full engine run). */
export const MAX_SWEEP_VALUES = 50;

/** POST /api/calc/sweep {design, path, values}: evaluates the design once per value of the input at `path`. */
export const sweepSchema = z.strictObject({
  design: designDocumentSchema,
  path: z
    .string({ message: 'is required: the dotted path of a numeric input, e.g. "pulley.driveTeeth"' })
    .trim()
    .min(1, 'is required')
    .max(100, 'must be at most 100 characters')
    .regex(/^[A-Za-z][A-Za-z0-9]*(\.[A-Za-z0-9]+)*$/, 'must be a dotted field path such as "pulley.driveTeeth"'),
  values: z
    .array(z.number({ message: 'must be a number' }).refine(Number.isFinite, 'must be a finite number'), {
      message: 'must be a list of numbers',
    })
    .min(1, 'must have at least 1 value')
    .max(MAX_SWEEP_VALUES, `must have at most ${MAX_SWEEP_VALUES} values`),
});
