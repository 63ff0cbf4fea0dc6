// What the client sends to /api/designs: the zod schemas the server validates with, and the types both sides use.
import { z } from 'zod';
import { MECHANISMS, safeParseDesign, type DesignInput, type DesignInputRaw } from '@/engine';
import { DESIGN_STATUSES } from '../enums';
import { idSchema, listOf, paginationSchema } from './common';

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
  template: z.enum(MECHANISMS, { message: `must be one of ${MECHANISMS.join(', ')}` }),
  name: designNameSchema.optional(),
});

/** POST /api/designs {copyOf, name?}: a new draft copied from another design. */
export const createCopySchema = z.strictObject({
  copyOf: z.union([z.number().int().positive(), idSchema], { message: 'must be the id of a design' }),
  name: designNameSchema.optional(),
});

/** The three ways to create a design, after validation (what the server's service receives). */
export type CreateDesignRequest =
  | { mode: 'document'; document: DesignInput }
  | { mode: 'template'; template: (typeof MECHANISMS)[number]; name?: string }
  | { mode: 'copy'; copyOf: number; name?: string };

/** What the client sends to create a design: a whole document (also how import works), a template, or a copy. */
export type CreateDesignBody = DesignInputRaw | z.input<typeof createFromTemplateSchema> | z.input<typeof createCopySchema>;

/**
 * POST /api/designs body: a design document (also how import works), `{template, name?}`, or `{copyOf, name?}`.
 * The presence of `template` or `copyOf` chooses the form; anything else is read as a document.
 */
export const createDesignSchema = z.unknown().transform((body, ctx): CreateDesignRequest => {
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

/** What the client sends to save a design: the inputs as edited and/or the name, with the version it last read. */
export type UpdateDesignBody = Omit<z.input<typeof updateDesignSchema>, 'inputs'> & { inputs?: DesignInputRaw };
/** A validated save (inputs normalised, defaults filled in). */
export type UpdateDesignRequest = z.output<typeof updateDesignSchema>;

/** Sortable columns of the Designs list; a leading "-" sorts descending. */
export const DESIGN_SORT_KEYS = ['name', 'updatedAt', 'status', 'mechanism', 'owner', 'createdAt'] as const;
export type DesignSortKey = (typeof DESIGN_SORT_KEYS)[number];
/** A sort value of the list: a key, or "-key" for descending (e.g. "-updatedAt"). */
export type DesignSort = DesignSortKey | `-${DesignSortKey}`;
const SORT_VALUES = DESIGN_SORT_KEYS.flatMap((key): DesignSort[] => [key, `-${key}`]) as [DesignSort, ...DesignSort[]];

/** GET /api/designs?page&pageSize&sort&q&status&mechanism&owner */
export const listDesignsQuerySchema = paginationSchema.extend({
  sort: z.enum(SORT_VALUES, { message: `must be one of ${DESIGN_SORT_KEYS.join(', ')} (prefix - for descending)` }).default('-updatedAt'),
  q: z.string({ message: 'must be a single search term' }).trim().max(200, 'must be at most 200 characters').optional(),
  status: listOf(DESIGN_STATUSES).optional(),
  mechanism: listOf(MECHANISMS).optional(),
  owner: z.union([z.literal('me'), idSchema], { message: 'must be "me" or a user id' }).optional(),
});

/** The Designs list query as the client sends it (`status` and `mechanism` take one value or a comma-separated list). */
export type DesignListQuery = z.input<typeof listDesignsQuerySchema>;
/** The Designs list query once validated (lists split, defaults filled in). */
export type DesignListRequest = z.output<typeof listDesignsQuerySchema>;
