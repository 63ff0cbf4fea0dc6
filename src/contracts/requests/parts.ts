// What an admin sends to /api/parts/<shelf> and the torque-table upload: the schemas and the field types.
import { z } from 'zod';
import { PULLEY_KINDS } from '../enums';
import type { PartShelf } from '../parts';
import { paginationSchema } from './common';

// Ranges follow the design schema (src/engine/schema.ts) so any part on the shelf can fill the Design desk
// form without the form then rejecting it.

const finite = () => z.number({ message: 'must be a number' }).refine(Number.isFinite, 'must be a finite number');
const between = (min: number, max: number) => finite().min(min, `must be at least ${min}`).max(max, `must be at most ${max}`);
const positive = (max: number) => finite().gt(0, 'must be greater than 0').max(max, `must be at most ${max}`);
const whole = (min: number, max: number) => between(min, max).int('must be a whole number');
const text = (max: number) => z.string({ message: 'must be text' }).trim().max(max, `must be at most ${max} characters`);
const nameSchema = z.string({ message: 'is required' }).trim().min(1, 'is required').max(120, 'must be at most 120 characters');
/** Free text that may be left out or sent as null (a cleared form field); stored as ''. */
const optionalText = (max: number) => z.preprocess((v) => (v === null ? '' : v), text(max)).default('');
const noteSchema = optionalText(2000);

/** One row of a torque–speed table: speed in revolutions per second, torque in N·m. */
export const torquePointSchema = z.strictObject({
  speedRevPerS: between(0, 1000),
  torqueNm: between(0, 100),
});

/** A torque–speed table: 2 to 500 rows, speeds strictly increasing (the CSV upload uses the same rule). */
export const torqueCurveSchema = z
  .array(torquePointSchema, { message: 'must be a list of {speedRevPerS, torqueNm} rows or null' })
  .min(2, 'must have at least 2 rows')
  .max(500, 'must have at most 500 rows')
  .superRefine((rows, ctx) => {
    for (let i = 1; i < rows.length; i++) {
      if (!(rows[i].speedRevPerS > rows[i - 1].speedRevPerS)) {
        ctx.addIssue({ code: 'custom', path: [i, 'speedRevPerS'], message: 'speeds must increase from row to row' });
      }
    }
  });

/** Supply voltage and driver RMS current a torque table was measured at. */
export const torqueConditionsSchema = z.strictObject({
  supplyV: positive(1000),
  currentRmsA: positive(50),
});

/**
 * The text fields of POST /api/parts/motors/:id/torque-curve (multipart, beside `file`): what the table was measured
 * at. Both are required, so every table on the shelf says which drive it describes.
 */
export const torqueUploadBodySchema = z.strictObject({
  supplyV: z.coerce.number({ message: 'is required: the supply voltage the table was measured at' }).pipe(positive(1000)),
  currentRmsA: z.coerce.number({ message: 'is required: the driver current (RMS) the table was measured at' }).pipe(positive(50)),
});

const beltShape = {
  name: nameSchema,
  profile: z.string({ message: 'is required' }).trim().min(1, 'is required').max(40, 'must be at most 40 characters'),
  standard: optionalText(120),
  pitchMm: positive(50),
  widthMm: positive(500),
  linearMassKgPerM: positive(10),
  axialStiffnessN: positive(1e8),
  allowableTensionN: positive(1e6),
  minPulleyTeeth: whole(1, 500),
  source: optionalText(500),
  note: noteSchema,
};

const pulleyShape = {
  name: nameSchema,
  teeth: whole(6, 500),
  pitchMm: positive(50),
  profile: z.string({ message: 'is required' }).trim().min(1, 'is required').max(40, 'must be at most 40 characters'),
  kind: z.enum(PULLEY_KINDS, { message: `must be one of ${PULLEY_KINDS.join(', ')}` }),
  boreMm: positive(100),
  inertiaKgM2: between(0, 1).nullable().default(null),
  note: noteSchema,
};

const motorShape = {
  name: nameSchema,
  frameMm: whole(10, 250),
  stepAngleDeg: between(0.1, 15),
  holdingTorqueNm: positive(100),
  ratedCurrentA: positive(50),
  phaseResistanceOhm: between(0, 1000),
  phaseInductanceMh: between(0, 10000),
  rotorInertiaKgM2: between(0, 1),
  massKg: between(0, 100),
  torqueCurve: torqueCurveSchema.nullable().default(null),
  torqueCurveConditions: torqueConditionsSchema.nullable().default(null),
  note: noteSchema,
};

/** POST /api/parts/belts — a belt profile, shaped like the design's `belt` plus what identifies it. */
export const beltPartSchema = z.strictObject(beltShape);
/** POST /api/parts/pulleys */
export const pulleyPartSchema = z.strictObject(pulleyShape);
/** POST /api/parts/motors — shaped like the design's `motor` plus frame size. */
export const motorPartSchema = z.strictObject(motorShape);

const retiredSchema = z.boolean({ message: 'must be true or false' });

/** PATCH bodies: any subset of the fields, plus `retired`; at least one field. Defaults are not applied. */
function patchSchema<T extends Record<string, z.ZodType>>(shape: T) {
  const optionalShape = Object.fromEntries(
    Object.entries(shape).map(([key, schema]) => {
      const inner = schema instanceof z.ZodDefault ? (schema.unwrap() as z.ZodType) : schema;
      return [key, inner.optional()];
    }),
  ) as { [K in keyof T]: z.ZodOptional<z.ZodType<z.output<T[K]>, z.input<T[K]>>> };
  return z.strictObject({ ...optionalShape, retired: retiredSchema.optional() }).refine((v) => Object.keys(v).length > 0, {
    message: 'give at least one field to change',
    // Only when the fields themselves are fine: `{colour: 'red'}` is reported as an unknown field, not as empty.
    when: (payload) => payload.issues.length === 0,
  });
}

/** PATCH /api/parts/belts/:id */
export const beltPartPatchSchema = patchSchema(beltShape);
/** PATCH /api/parts/pulleys/:id */
export const pulleyPartPatchSchema = patchSchema(pulleyShape);
/** PATCH /api/parts/motors/:id */
export const motorPartPatchSchema = patchSchema(motorShape);

/** `?includeRetired=1|true|0|false` */
const flagSchema = z
  .enum(['1', '0', 'true', 'false'], { message: 'must be 1, 0, true or false' })
  .transform((v) => v === '1' || v === 'true');

/** GET /api/parts/<shelf>?page&pageSize&q&includeRetired — 100 per page by default, the whole starter shelf. */
export const listPartsQuerySchema = paginationSchema.extend({
  pageSize: paginationSchema.shape.pageSize.unwrap().default(100),
  q: z.string({ message: 'must be a single search term' }).trim().max(100, 'must be at most 100 characters').optional(),
  includeRetired: flagSchema.default(false),
});

export type BeltPartInput = z.output<typeof beltPartSchema>;
export type PulleyPartInput = z.output<typeof pulleyPartSchema>;
export type MotorPartInput = z.output<typeof motorPartSchema>;
export type PartInput = BeltPartInput | PulleyPartInput | MotorPartInput;
export type PartPatch = Partial<PartInput> & { retired?: boolean };
export type ListPartsQuery = z.output<typeof listPartsQuerySchema>;
/** A part's fields per shelf, as validated (defaults filled in): what adding a part sends and the shelf stores. */
export interface PartInputOf extends Record<PartShelf, PartInput> {
  belts: BeltPartInput;
  pulleys: PulleyPartInput;
  motors: MotorPartInput;
}
