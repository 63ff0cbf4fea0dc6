import type { ErrorBody, ErrorDetail } from './types';

/**
 * The single HTTP client of the app. It is the only place that knows the API's base URL, its headers
 * and its error shape: every non-2xx answer (and a network failure) becomes an {@link ApiError}.
 */

/** Where the API lives, relative to the page (the server serves both). */
const API_BASE = '/api';

/** Paths whose 401 means "wrong credentials" or "not signed in yet", not "session expired". */
const AUTH_PATH_PREFIX = '/auth/';

/** A failed API call: HTTP status, machine-readable code, a message fit for people, and field details. */
export class ApiError extends Error {
  /** HTTP status; 0 when the server could not be reached. */
  readonly status: number;
  /** Machine-readable code from the API (`invalid_credentials`, `validation_failed`, …). */
  readonly code: string;
  /** Field-level problems, when the API reported them. */
  readonly details: ErrorDetail[];
  /** The decoded response body, for the rare caller that needs more than the error shape (e.g. health's 503). */
  readonly body: unknown;

  constructor(status: number, code: string, message: string, details: ErrorDetail[] = [], body: unknown = undefined) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.details = details;
    this.body = body;
  }

  /**
   * Maps field paths to their first message, for showing errors beside form fields.
   * A nested path is also reported under its first segment (`roles.0` → `roles`) so a form item
   * bound to the whole array shows it.
   * @returns an object keyed by field path
   */
  fieldErrors(): Record<string, string> {
    const out: Record<string, string> = {};
    for (const d of this.details) {
      const text = asSentence(d.message);
      if (!(d.path in out)) out[d.path] = text;
      const head = d.path.split('.')[0];
      if (head && !(head in out)) out[head] = text;
    }
    return out;
  }

  /**
   * The message plus each field problem, for places without a field to show them beside:
   * "The request is not valid. Password must be at least 12 characters."
   */
  describe(): string {
    if (this.details.length === 0) return this.message;
    const parts = this.details.map((d) => asSentence(`${humanizePath(d.path)} ${d.message}`));
    return [this.message, ...parts].join(' ');
  }
}

/** "roles.0" → "Roles 0"; "pageSize" → "Page size". */
function humanizePath(path: string): string {
  const words = path
    .replace(/\./g, ' ')
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** Capitalises the first letter and ends with a full stop. */
function asSentence(text: string): string {
  const t = text.trim();
  if (!t) return t;
  const capitalised = t.charAt(0).toUpperCase() + t.slice(1);
  return /[.!?]$/.test(capitalised) ? capitalised : `${capitalised}.`;
}

/** Narrows an unknown thrown value to an {@link ApiError}. */
export function isApiError(err: unknown): err is ApiError {
  return err instanceof ApiError;
}

type UnauthorizedHandler = (error: ApiError) => void;
let unauthorizedHandler: UnauthorizedHandler | null = null;

/**
 * Registers what happens when a non-auth call answers 401 (the session expired or was revoked):
 * main.ts clears the auth store and sends the user to the sign-in page. The error is still thrown
 * to the caller afterwards.
 * @param handler - called with the error; pass `null` to remove
 */
export function setUnauthorizedHandler(handler: UnauthorizedHandler | null): void {
  unauthorizedHandler = handler;
}

/** Query parameters; `undefined`, `null` and `''` values are left out. */
export type QueryParams = Record<string, string | number | boolean | null | undefined>;

/** Options of {@link request}. */
export interface RequestOptions {
  /** Sent as JSON. */
  body?: unknown;
  /** Appended to the URL as a query string. */
  params?: QueryParams;
  /** Sent as multipart/form-data (file uploads); takes precedence over `body`. */
  formData?: FormData;
  signal?: AbortSignal;
}

/** HTTP methods the API uses. */
export type HttpMethod = 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';

/**
 * Builds the full URL of an API path (for links the browser opens itself, such as a PDF download).
 * @param path - API path starting with `/`, e.g. `/sheets/3/pdf`
 * @param params - optional query parameters
 * @returns the URL relative to the page origin
 */
export function apiUrl(path: string, params?: QueryParams): string {
  const query = new URLSearchParams();
  for (const [key, value] of Object.entries(params ?? {})) {
    if (value === undefined || value === null || value === '') continue;
    query.append(key, String(value));
  }
  const qs = query.toString();
  return `${API_BASE}${path}${qs ? `?${qs}` : ''}`;
}

const STATUS_MESSAGES: Record<number, string> = {
  400: 'The request was not accepted.',
  401: 'Please sign in again.',
  403: 'You are not allowed to do that.',
  404: 'Not found.',
  409: 'That conflicts with the current state. Reload and try again.',
  413: 'That is too large.',
  415: 'That file type is not accepted.',
  422: 'That could not be processed.',
  429: 'Too many requests. Wait a moment and try again.',
  503: 'The service is temporarily unavailable.',
};

function isErrorBody(value: unknown): value is ErrorBody {
  if (typeof value !== 'object' || value === null) return false;
  const error = (value as { error?: unknown }).error;
  return typeof error === 'object' && error !== null && typeof (error as { message?: unknown }).message === 'string';
}

async function readBody(response: Response): Promise<unknown> {
  if (response.status === 204 || response.status === 205) return undefined;
  const text = await response.text();
  if (!text) return undefined;
  const type = response.headers.get('content-type') ?? '';
  if (!type.includes('json')) return text;
  try {
    return JSON.parse(text);
  } catch {
    return text;
  }
}

function toApiError(status: number, body: unknown): ApiError {
  if (isErrorBody(body)) {
    const { code, message, details } = body.error;
    return new ApiError(status, code || `http_${status}`, message, Array.isArray(details) ? details : [], body);
  }
  const fallback =
    STATUS_MESSAGES[status] ?? (status >= 500 ? 'The server had a problem. Try again shortly.' : `Request failed (HTTP ${status}).`);
  return new ApiError(status, `http_${status}`, fallback, [], body);
}

/**
 * Calls the API and returns the parsed JSON body (or `undefined` for 204).
 * Sends the session cookie (same origin). Throws {@link ApiError} on any non-2xx answer or when
 * the server cannot be reached (status 0, code `network_error`).
 * @param method - HTTP method
 * @param path - API path starting with `/`, e.g. `/users`
 * @param options - JSON body, query params or form data
 * @returns the decoded response body
 */
export async function request<T>(method: HttpMethod, path: string, options: RequestOptions = {}): Promise<T> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  let payload: BodyInit | undefined;
  if (options.formData) {
    payload = options.formData; // the browser sets the multipart boundary itself
  } else if (options.body !== undefined) {
    headers['Content-Type'] = 'application/json';
    payload = JSON.stringify(options.body);
  }

  let response: Response;
  try {
    response = await fetch(apiUrl(path, options.params), {
      method,
      headers,
      body: payload,
      credentials: 'same-origin',
      signal: options.signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError(0, 'network_error', 'Cannot reach the server. Check your connection and try again.');
  }

  const body = await readBody(response);
  if (response.ok) return body as T;

  const error = toApiError(response.status, body);
  if (response.status === 401 && !path.startsWith(AUTH_PATH_PREFIX)) unauthorizedHandler?.(error);
  throw error;
}

/** GET `path` with optional query parameters. */
export function get<T>(path: string, params?: QueryParams, signal?: AbortSignal): Promise<T> {
  return request<T>('GET', path, { params, signal });
}

/** POST a JSON body. */
export function post<T>(path: string, body?: unknown): Promise<T> {
  return request<T>('POST', path, { body });
}

/** PATCH a JSON body. */
export function patch<T>(path: string, body: unknown): Promise<T> {
  return request<T>('PATCH', path, { body });
}

/** DELETE a resource. */
export function del<T = void>(path: string): Promise<T> {
  return request<T>('DELETE', path);
}

/** POST multipart/form-data (file uploads). */
export function upload<T>(path: string, formData: FormData): Promise<T> {
  return request<T>('POST', path, { formData });
}
