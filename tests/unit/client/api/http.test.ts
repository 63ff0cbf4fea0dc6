import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError, apiUrl, get, post, request, setUnauthorizedHandler, upload } from '@/api/http';

function jsonResponse(status: number, body: unknown): Response {
  return new Response(body === undefined ? null : JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json; charset=utf-8' },
  });
}

describe('api/http request', () => {
  const fetchMock = vi.fn<typeof fetch>();

  beforeEach(() => {
    fetchMock.mockReset();
    vi.stubGlobal('fetch', fetchMock);
  });

  afterEach(() => {
    vi.unstubAllGlobals();
    setUnauthorizedHandler(null);
  });

  it('when the answer is 2xx JSON, then returns the decoded body and sends cookies same-origin', async () => {
    // Arrange
    fetchMock.mockResolvedValue(jsonResponse(200, { items: [], total: 0, page: 1, pageSize: 20 }));
    // Act
    const result = await get<{ total: number }>('/users', { page: 1, q: '' });
    // Assert
    expect(result.total).toBe(0);
    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/users?page=1');
    expect(init?.credentials).toBe('same-origin');
    expect(init?.method).toBe('GET');
  });

  it('when posting a body, then sends it as JSON with a JSON content type', async () => {
    fetchMock.mockResolvedValue(jsonResponse(200, { user: { id: 1 } }));
    await post('/auth/login', { email: 'a@example.test', password: 'x' });
    const init = fetchMock.mock.calls[0][1]!;
    expect((init.headers as Record<string, string>)['Content-Type']).toBe('application/json');
    expect(init.body).toBe(JSON.stringify({ email: 'a@example.test', password: 'x' }));
  });

  it('when uploading form data, then leaves the content type to the browser', async () => {
    fetchMock.mockResolvedValue(jsonResponse(201, { id: 7 }));
    const form = new FormData();
    form.append('file', new Blob(['a,b']), 'curve.csv');
    await upload('/parts/motors/1/torque-curve', form);
    const init = fetchMock.mock.calls[0][1]!;
    expect(init.body).toBe(form);
    expect((init.headers as Record<string, string>)['Content-Type']).toBeUndefined();
  });

  it('when the answer is 204, then resolves to undefined', async () => {
    fetchMock.mockResolvedValue(new Response(null, { status: 204 }));
    await expect(post('/auth/logout')).resolves.toBeUndefined();
  });

  it('when the API answers a validation error, then throws ApiError with status, code, message and details', async () => {
    // Arrange
    fetchMock.mockResolvedValue(
      jsonResponse(400, {
        error: {
          code: 'validation_failed',
          message: 'The request is not valid.',
          details: [{ path: 'roles.0', message: 'must be one of admin, designer' }],
        },
      }),
    );
    // Act
    const error = await request('POST', '/users', { body: {} }).catch((e: unknown) => e);
    // Assert
    expect(error).toBeInstanceOf(ApiError);
    const apiError = error as ApiError;
    expect(apiError.status).toBe(400);
    expect(apiError.code).toBe('validation_failed');
    expect(apiError.message).toBe('The request is not valid.');
    expect(apiError.details).toEqual([{ path: 'roles.0', message: 'must be one of admin, designer' }]);
    expect(apiError.fieldErrors()).toEqual({ 'roles.0': 'Must be one of admin, designer.', roles: 'Must be one of admin, designer.' });
    expect(apiError.describe()).toBe('The request is not valid. Roles 0 must be one of admin, designer.');
  });

  it.each([
    [502, 'text/html', '<html>Bad gateway</html>', 'http_502', 'The server had a problem. Try again shortly.'],
    [413, 'text/plain', 'too big', 'http_413', 'That is too large.'],
    [404, 'application/json', '{"unexpected":true}', 'http_404', 'Not found.'],
    [500, 'application/json', '{not json', 'http_500', 'The server had a problem. Try again shortly.'],
  ])('when a %i answer has no error body (%s), then throws a generic ApiError', async (status, type, text, code, message) => {
    fetchMock.mockResolvedValue(new Response(text, { status, headers: { 'Content-Type': type } }));
    const error = (await get('/anything').catch((e: unknown) => e)) as ApiError;
    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(status);
    expect(error.code).toBe(code);
    expect(error.message).toBe(message);
    expect(error.details).toEqual([]);
  });

  it('when the server cannot be reached, then throws ApiError with status 0 and code network_error', async () => {
    fetchMock.mockRejectedValue(new TypeError('Failed to fetch'));
    const error = (await get('/health').catch((e: unknown) => e)) as ApiError;
    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(0);
    expect(error.code).toBe('network_error');
  });

  it('when a data call answers 401, then calls the unauthorized handler and still throws', async () => {
    const handler = vi.fn();
    setUnauthorizedHandler(handler);
    fetchMock.mockResolvedValue(jsonResponse(401, { error: { code: 'unauthenticated', message: 'Sign in first.' } }));
    const error = (await get('/users').catch((e: unknown) => e)) as ApiError;
    expect(error.status).toBe(401);
    expect(handler).toHaveBeenCalledTimes(1);
    expect(handler.mock.calls[0][0]).toBe(error);
  });

  it.each(['/auth/login', '/auth/me'])('when %s answers 401, then does not call the unauthorized handler', async (path) => {
    const handler = vi.fn();
    setUnauthorizedHandler(handler);
    fetchMock.mockResolvedValue(jsonResponse(401, { error: { code: 'invalid_credentials', message: 'Wrong e-mail or password.' } }));
    const error = (await request('POST', path, { body: {} }).catch((e: unknown) => e)) as ApiError;
    expect(error.message).toBe('Wrong e-mail or password.');
    expect(handler).not.toHaveBeenCalled();
  });
});

describe('api/http apiUrl', () => {
  it.each([
    ['/sheets/3/pdf', undefined, '/api/sheets/3/pdf'],
    [
      '/designs',
      { q: 'plotter stage', page: 2, status: undefined, sort: null, flag: false },
      '/api/designs?q=plotter+stage&page=2&flag=false',
    ],
    ['/designs', { q: '' }, '/api/designs'],
  ])('when given %s with %o, then builds %s', (path, params, expected) => {
    expect(apiUrl(path, params)).toBe(expected);
  });
});
