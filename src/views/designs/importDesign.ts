import { safeParseDesign, type DesignInput, type InputIssue } from '@/engine';

/** Largest design file accepted [bytes]; a design is a few kB. */
export const IMPORT_MAX_BYTES = 512 * 1024;

/** Outcome of reading a design file. */
export type ImportOutcome = { ok: true; design: DesignInput } | { ok: false; issues: InputIssue[] };

/**
 * Reads a design document from the text of a JSON file and validates it with the shared schema, so the
 * messages name the field exactly as the API would ("frame.outerXMm: outer X size must be greater than 0").
 * @param text - file contents
 * @returns the validated design, or the problems found
 */
export function parseDesignFile(text: string): ImportOutcome {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    const why = err instanceof Error ? err.message : 'not valid JSON';
    return { ok: false, issues: [{ path: '', message: `The file is not valid JSON (${why}).` }] };
  }
  if (typeof json !== 'object' || json === null || Array.isArray(json)) {
    return { ok: false, issues: [{ path: '', message: 'The file must hold one design object, not a list or a single value.' }] };
  }
  const parsed = safeParseDesign(json);
  return parsed.ok ? { ok: true, design: parsed.value } : { ok: false, issues: parsed.issues };
}

/**
 * Reads and validates a design file the person picked.
 * @param file - the picked file
 */
export async function readDesignFile(file: File): Promise<ImportOutcome> {
  if (file.size > IMPORT_MAX_BYTES) {
    return {
      ok: false,
      issues: [
        { path: '', message: `The file is ${Math.round(file.size / 1024)} kB; a design file is at most ${IMPORT_MAX_BYTES / 1024} kB.` },
      ],
    };
  }
  return parseDesignFile(await file.text());
}
