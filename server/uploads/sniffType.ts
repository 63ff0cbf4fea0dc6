/** Content types the product stores, as found from a file's bytes. */
export type SniffedMime = 'application/pdf' | 'image/png' | 'image/jpeg' | 'audio/wav' | 'text/csv' | 'text/plain';

/** What a file's bytes say it is. */
export interface SniffedType {
  mime: SniffedMime;
  /** Canonical extension, without the dot. */
  ext: 'pdf' | 'png' | 'jpg' | 'wav' | 'csv' | 'txt';
}

/** Why an upload's type was refused. */
export type UploadTypeErrorCode = 'empty_file' | 'unsupported_type' | 'type_mismatch';

/** An upload whose content is not an accepted type or does not match its name or declared type (answered with 415). */
export class UploadTypeError extends Error {
  readonly code: UploadTypeErrorCode;
  /** HTTP status a route should answer with. */
  readonly httpStatus = 415;

  constructor(code: UploadTypeErrorCode, message: string) {
    super(message);
    this.name = 'UploadTypeError';
    this.code = code;
  }
}

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
const TEXT_SNIFF_BYTES = 64 * 1024;

function startsWith(bytes: Uint8Array, signature: readonly number[], offset = 0): boolean {
  if (bytes.length < offset + signature.length) return false;
  return signature.every((b, i) => bytes[offset + i] === b);
}

function ascii(text: string): number[] {
  return Array.from(text, (c) => c.charCodeAt(0));
}

/**
 * Identifies a file from its first bytes (magic numbers), never from its name:
 * PDF (`%PDF-`), PNG (8-byte signature), JPEG (`FF D8 FF`), WAV (`RIFF`/`RIFX`/`RF64` + `WAVE` at byte 8), and text
 * — valid UTF-8 without NUL or other control characters besides tab, CR and LF (an optional BOM is allowed) —
 * reported as CSV when its first line holds a comma, semicolon or tab, else as plain text.
 * @param bytes - the file's content
 * @returns the type, or null when the content is empty or none of these
 */
export function sniffType(bytes: Uint8Array): SniffedType | null {
  if (bytes.length === 0) return null;
  if (startsWith(bytes, ascii('%PDF-'))) return { mime: 'application/pdf', ext: 'pdf' };
  if (startsWith(bytes, PNG_SIGNATURE)) return { mime: 'image/png', ext: 'png' };
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return { mime: 'image/jpeg', ext: 'jpg' };
  const riff = ['RIFF', 'RIFX', 'RF64'].some((id) => startsWith(bytes, ascii(id)));
  if (riff && startsWith(bytes, ascii('WAVE'), 8)) return { mime: 'audio/wav', ext: 'wav' };
  return sniffText(bytes);
}

function sniffText(bytes: Uint8Array): SniffedType | null {
  let text: string;
  try {
    // The whole file must decode: a binary tail behind a text-looking head is not text.
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return null;
  }
  if (text.startsWith('\uFEFF')) text = text.slice(1);
  if (text.length === 0) return null;
  // Control characters (C0 except tab/LF/CR, DEL, C1) mark binary data or a different encoding.
  if (/[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/.test(text)) return null;
  const head = text.slice(0, TEXT_SNIFF_BYTES);
  const firstLine = head.split(/\r\n|\r|\n/).find((l) => l.trim() !== '') ?? '';
  return /[,;\t]/.test(firstLine) ? { mime: 'text/csv', ext: 'csv' } : { mime: 'text/plain', ext: 'txt' };
}

/** What families of content a declared MIME type or file extension may stand for. */
type Family = 'pdf' | 'png' | 'jpeg' | 'wav' | 'text';

const FAMILY_OF_MIME: Record<SniffedMime, Family> = {
  'application/pdf': 'pdf',
  'image/png': 'png',
  'image/jpeg': 'jpeg',
  'audio/wav': 'wav',
  'text/csv': 'text',
  'text/plain': 'text',
};

// What browsers and operating systems send; Windows browsers often label .csv as application/vnd.ms-excel.
const DECLARED_MIME_FAMILY: Record<string, Family> = {
  'application/pdf': 'pdf',
  'application/x-pdf': 'pdf',
  'image/png': 'png',
  'image/jpeg': 'jpeg',
  'image/jpg': 'jpeg',
  'image/pjpeg': 'jpeg',
  'audio/wav': 'wav',
  'audio/wave': 'wav',
  'audio/x-wav': 'wav',
  'audio/vnd.wave': 'wav',
  'audio/x-pn-wav': 'wav',
  'text/csv': 'text',
  'text/plain': 'text',
  'text/x-csv': 'text',
  'text/comma-separated-values': 'text',
  'application/csv': 'text',
  'application/vnd.ms-excel': 'text',
};

/** Declared types that claim nothing about the content. */
const NEUTRAL_MIMES = new Set(['', 'application/octet-stream', 'binary/octet-stream']);

const EXTENSION_FAMILY: Record<string, Family> = {
  pdf: 'pdf',
  png: 'png',
  jpg: 'jpeg',
  jpeg: 'jpeg',
  jpe: 'jpeg',
  wav: 'wav',
  wave: 'wav',
  csv: 'text',
  txt: 'text',
};

const FAMILY_LABEL: Record<Family, string> = { pdf: 'PDF', png: 'PNG', jpeg: 'JPEG', wav: 'WAV', text: 'text/CSV' };

/**
 * Checks an upload's content against the accepted types and against what its name and the browser claim.
 * The content decides; the name and declared type may only agree with it (`application/octet-stream` and an
 * empty type claim nothing; a name without an extension is accepted).
 * @param declaredMime - Content-Type the client sent for the part (parameters such as `; charset=` are ignored)
 * @param filename - the client's file name (only its extension is looked at)
 * @param bytes - the file's content
 * @param allowed - accepted sniffed MIME types, e.g. ['application/pdf', 'image/png', 'image/jpeg', 'text/csv']
 * @returns the sniffed type (use its `mime` for Content-Type when serving the file)
 * @throws UploadTypeError 'empty_file' | 'unsupported_type' | 'type_mismatch'
 */
export function assertTypeMatches(
  declaredMime: string | undefined | null,
  filename: string,
  bytes: Uint8Array,
  allowed: readonly SniffedMime[],
): SniffedType {
  const accepted = [...new Set(allowed.map((m) => FAMILY_LABEL[FAMILY_OF_MIME[m]]))].join(', ');
  if (bytes.length === 0) throw new UploadTypeError('empty_file', `"${filename}" is empty.`);
  const sniffed = sniffType(bytes);
  // text/plain and text/csv differ only by a guess at the first line: either satisfies the other.
  const allowedFamilies = new Set(allowed.map((m) => FAMILY_OF_MIME[m]));
  if (!sniffed || !allowedFamilies.has(FAMILY_OF_MIME[sniffed.mime])) {
    const what = sniffed ? `a ${FAMILY_LABEL[FAMILY_OF_MIME[sniffed.mime]]} file` : 'not a file type we accept';
    throw new UploadTypeError('unsupported_type', `"${filename}" is ${what}; accepted here: ${accepted}.`);
  }
  const family = FAMILY_OF_MIME[sniffed.mime];
  const label = FAMILY_LABEL[family];

  const dot = filename.lastIndexOf('.');
  if (dot > 0 && dot < filename.length - 1) {
    const ext = filename.slice(dot + 1).toLowerCase();
    if (EXTENSION_FAMILY[ext] !== family) {
      throw new UploadTypeError('type_mismatch', `"${filename}" is named .${ext} but contains ${label} data.`);
    }
  }

  const declared = (declaredMime ?? '').split(';')[0].trim().toLowerCase();
  if (!NEUTRAL_MIMES.has(declared) && DECLARED_MIME_FAMILY[declared] !== family) {
    throw new UploadTypeError('type_mismatch', `"${filename}" was sent as ${declared} but contains ${label} data.`);
  }
  return sniffed;
}
