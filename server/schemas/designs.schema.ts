import { z } from 'zod';
import { safeParseDesign, type DesignInput } from '@/engine';
import { DESIGN_MECHANISMS, DESIGN_STATUSES } from '../models';
import { idSchema, paginationSchema } from './common.schema';

/**
 * A design document (src/engine/README.md), validated by the engine's own schema so the API answers with exactly the
 * messages the Design desk form shows. Issues keep the engine's dotted paths ("belt.pitchMm"); when the document
 * sits under a key of the body (`inputs`, `design`) zod prefixes that key ("inputs.belt.pitchMm").
 * The output is the normalised document with every default filled in.
 */
export const designDocumentSchema = z.unknown().transform((value, ctx): DesignInput => {
  const parsed = safeParseDesign(value);
  if (parsed.ok) return parsed.value;
  for (const issue of parsed.issues) {
    ctx.addIssue({
      code: 'custom',
      message: issue.message,
      path: issue.path ? issue.path.split('.').map((p) => (/^\d+$/.test(p) ? Number(p) : p)) : [],
    });
  }
  return z.NEVER;
});

const designNameSchema = z
  .string({ message: 'must be text' })
  .trim()
  .min(1, 'must not be empty')
  .max(200, 'must be at most 200 characters');

/** POST /api/designs {template, name?}: a new draft from a mechanism template. */
export const createFromTemplateSchema = z.strictObject({
  template: z.enum(DESIGN_MECHANISMS, { message: `must be one of ${DESIGN_MECHANISMS.join(', ')}` }),
  name: designNameSchema.optional(),
});

/** POST /api/designs {copyOf, name?}: a new draft copied from another design. */
export const createCopySchema = z.strictObject({
  copyOf: z.union([z.number().int().positive(), idSchema], { message: 'must be the id of a design' }),
  name: designNameSchema.optional(),
});

/** The three ways to create a design, after validation. */
export type CreateDesignInput =
  | { mode: 'document'; document: DesignInput }
  | { mode: 'template'; template: (typeof DESIGN_MECHANISMS)[number]; name?: string }
  | { mode: 'copy'; copyOf: number; name?: string };

/**
 * POST /api/designs body: a design document (also how import works), `{template, name?}`, or `{copyOf, name?}`.
 * The presence of `template` or `copyOf` chooses the form; anything else is read as a document.
 */
export const createDesignSchema = z.unknown().transform((body, ctx): CreateDesignInput => {
  const isObject = typeof body === 'object' && body !== null && !Array.isArray(body);
  if (!isObject) {
    ctx.addIssue({ code: 'custom', message: 'must be a JSON object: a design document, {template, name} or {copyOf, name}', path: [] });
    return z.NEVER;
  }
  const schema = 'template' in body ? createFromTemplateSchema : 'copyOf' in body ? createCopySchema : null;
  const result = schema ? schema.safeParse(body) : designDocumentSchema.safeParse(body);
  if (!result.success) {
    for (const issue of result.error.issues) {
      if (issue.code === 'unrecognized_keys') {
        for (const key of issue.keys) ctx.addIssue({ code: 'custom', message: 'is not a known field', path: [...issue.path, key] });
      } else {
        ctx.addIssue({ code: 'custom', message: issue.message, path: issue.path });
      }
    }
    return z.NEVER;
  }
  if ('template' in body) return { mode: 'template', ...(result.data as z.output<typeof createFromTemplateSchema>) };
  if ('copyOf' in body) {
    const data = result.data as z.output<typeof createCopySchema>;
    return { mode: 'copy', copyOf: Number(data.copyOf), name: data.name };
  }
  return { mode: 'document', document: result.data as DesignInput };
});

/** PATCH /api/designs/:id {inputs?, name?, version}: `version` is the one the client last read (optimistic lock). */
export const updateDesignSchema = z
  .strictObject({
    inputs: designDocumentSchema.optional(),
    name: designNameSchema.optional(),
    version: z.number({ message: 'is required: the version you last read' }).int('must be a whole number').min(1, 'must be 1 or more'),
  })
  .refine((v) => v.inputs !== undefined || v.name !== undefined, {
    message: 'give inputs or name to change',
    when: (payload) => payload.issues.length === 0,
  });

export type UpdateDesignInput = { inputs?: DesignInput; name?: string; version: number };

/** Sort keys of the Designs table; a leading "-" sorts descending. */
export const DESIGN_SORT_KEYS = ['name', 'updatedAt', 'status', 'mechanism', 'owner', 'createdAt'] as const;
const SORT_VALUES = DESIGN_SORT_KEYS.flatMap((key) => [key, `-${key}`]) as [string, ...string[]];

/** A comma-separated list of allowed values (`?status=draft,returned`). */
function listOf<T extends string>(values: readonly T[]) {
  return z
    .string({ message: 'must be a single value or a comma-separated list' })
    .transform((v) =>
      v
        .split(',')
        .map((s) => s.trim())
        .filter(Boolean),
    )
    .refine(
      (list) => list.length > 0 && list.every((v) => (values as readonly string[]).includes(v)),
      `must be one or more of ${values.join(', ')}`,
    )
    .transform((list) => list as T[]);
}

/** GET /api/designs?page&pageSize&sort&q&status&mechanism&owner */
export const listDesignsQuerySchema = paginationSchema.extend({
  sort: z.enum(SORT_VALUES, { message: `must be one of ${DESIGN_SORT_KEYS.join(', ')} (prefix - for descending)` }).default('-updatedAt'),
  q: z.string({ message: 'must be a single search term' }).trim().max(200, 'must be at most 200 characters').optional(),
  status: listOf(DESIGN_STATUSES).optional(),
  mechanism: listOf(DESIGN_MECHANISMS).optional(),
  owner: z.union([z.literal('me'), idSchema], { message: 'must be "me" or a user id' }).optional(),
});

export type ListDesignsQuery = {
  page: number;
  pageSize: number;
  sort: string;
  q?: string;
  status?: (typeof DESIGN_STATUSES)[number][];
  mechanism?: (typeof DESIGN_MECHANISMS)[number][];
  owner?: 'me' | number;
};
