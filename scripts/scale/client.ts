/**
 * The HTTP side of a simulated user in the scale test: one session cookie, the Origin header a browser sends with
 * every request of the app's own pages (so the server's cross-site checks see a same-origin request), and a record
 * of every request (when, how long, status, which app process answered, what went wrong).
 */

/** One request as the scale test counts it. */
export type RequestRecord = {
  /** Start time [ms since the epoch]. */
  at: number;
  /** Duration [ms]. */
  ms: number;
  method: string;
  /** Route pattern ("/api/designs/:id"), not the concrete path. */
  route: string;
  /** HTTP status, or 0 when no answer arrived (connection refused, reset, timeout). */
  status: number;
  /** Error code from the body, or the network error's name. */
  code?: string;
  /** The app process that answered (the balancer's X-Served-By header). */
  servedBy?: string;
};

/** An answer: status, parsed JSON (or bytes) and headers. */
export type Reply<T = unknown> = { status: number; body: T; bytes?: Buffer; headers: Headers; code?: string };

const REQUEST_TIMEOUT_MS = 60_000;

/** A client bound to one base address (the balancer, or one app process). */
export class ScaleClient {
  private cookie = '';

  constructor(
    readonly baseUrl: string,
    /** The origin the app is served from (APP_URL): what a browser puts in Origin. */
    readonly origin: string,
    private readonly record: (r: RequestRecord) => void,
  ) {}

  /** A second client with the same session but another base address. */
  withBase(baseUrl: string): ScaleClient {
    const other = new ScaleClient(baseUrl, this.origin, this.record);
    other.cookie = this.cookie;
    return other;
  }

  async request<T = unknown>(
    method: string,
    path: string,
    options: { route?: string; json?: unknown; form?: FormData; binary?: boolean; origin?: string } = {},
  ): Promise<Reply<T>> {
    // What a browser sends: the page's origin, and whether that page belongs to the app's own site.
    const origin = options.origin ?? this.origin;
    const headers: Record<string, string> = {
      Accept: 'application/json',
      Origin: origin,
      'Sec-Fetch-Site': origin === this.origin ? 'same-origin' : 'cross-site',
    };
    if (this.cookie) headers.Cookie = this.cookie;
    let body: string | FormData | undefined;
    if (options.json !== undefined) {
      headers['Content-Type'] = 'application/json';
      body = JSON.stringify(options.json);
    } else if (options.form) {
      body = options.form;
    }
    const at = Date.now();
    const route = options.route ?? path.replace(/\/\d+(?=\/|$|\?)/g, '/:id').replace(/\?.*$/, '');
    try {
      const res = await fetch(`${this.baseUrl}${path}`, { method, headers, body, signal: AbortSignal.timeout(REQUEST_TIMEOUT_MS) });
      const setCookie = res.headers.getSetCookie().find((c) => c.startsWith('gw_session='));
      if (setCookie) this.cookie = setCookie.split(';')[0];
      let parsed: unknown = null;
      let bytes: Buffer | undefined;
      if (options.binary && res.ok) {
        bytes = Buffer.from(await res.arrayBuffer());
      } else {
        const text = await res.text();
        try {
          parsed = text ? JSON.parse(text) : null;
        } catch {
          parsed = text;
        }
      }
      const code = (parsed as { error?: { code?: string } } | null)?.error?.code;
      this.record({
        at,
        ms: Date.now() - at,
        method,
        route,
        status: res.status,
        code,
        servedBy: res.headers.get('x-served-by') ?? undefined,
      });
      return { status: res.status, body: parsed as T, bytes, headers: res.headers, code };
    } catch (err) {
      const name = (err as { cause?: { code?: string }; name?: string }).cause?.code ?? (err as Error).name ?? 'network_error';
      this.record({ at, ms: Date.now() - at, method, route, status: 0, code: name });
      return { status: 0, body: null as T, headers: new Headers(), code: name };
    }
  }

  get<T = unknown>(path: string, options: { route?: string; binary?: boolean } = {}) {
    return this.request<T>('GET', path, options);
  }

  post<T = unknown>(path: string, json: unknown, options: { route?: string; origin?: string } = {}) {
    return this.request<T>('POST', path, { ...options, json });
  }

  patch<T = unknown>(path: string, json: unknown, options: { route?: string } = {}) {
    return this.request<T>('PATCH', path, { ...options, json });
  }

  upload<T = unknown>(path: string, form: FormData, options: { route?: string } = {}) {
    return this.request<T>('POST', path, { ...options, form });
  }
}
