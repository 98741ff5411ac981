import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError } from './api-error';
import { configureHttpClient, http, request, toQueryString } from './http-client';

function jsonResponse(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });
}

describe('http-client', () => {
  let fetchMock: ReturnType<typeof vi.fn>;

  beforeEach(() => {
    fetchMock = vi.fn();
    vi.stubGlobal('fetch', fetchMock);
    configureHttpClient({ csrfToken: () => 'csrf-123' });
  });

  afterEach(() => {
    vi.unstubAllGlobals();
  });

  describe('requests', () => {
    it('should call /api/v1 with same-origin credentials and no CSRF header when the method is GET', async () => {
      fetchMock.mockResolvedValue(jsonResponse(200, { ok: true }));

      await expect(http.get('/people', { limit: 5, q: '', role: undefined })).resolves.toEqual({ ok: true });

      const [url, init] = fetchMock.mock.calls[0];
      expect(url).toBe('/api/v1/people?limit=5');
      expect(init.credentials).toBe('same-origin');
      expect(init.headers['x-csrf-token']).toBeUndefined();
    });

    it('should send JSON and the CSRF token when the method changes something', async () => {
      fetchMock.mockResolvedValue(jsonResponse(201, { id: 'x' }));

      await http.post('/institutions', { name: 'Kestrel University' });

      const [, init] = fetchMock.mock.calls[0];
      expect(init.method).toBe('POST');
      expect(init.headers['x-csrf-token']).toBe('csrf-123');
      expect(init.headers['content-type']).toBe('application/json');
      expect(JSON.parse(init.body)).toEqual({ name: 'Kestrel University' });
    });

    it('should send the CSRF token on DELETE and resolve to undefined when the answer is 204', async () => {
      fetchMock.mockResolvedValue(new Response(null, { status: 204 }));

      await expect(http.delete('/me/tokens/abc')).resolves.toBeUndefined();
      expect(fetchMock.mock.calls[0][1].headers['x-csrf-token']).toBe('csrf-123');
    });
  });

  describe('errors', () => {
    it('should throw an ApiError with the server code, message and details when the answer is an error body', async () => {
      fetchMock.mockResolvedValue(
        jsonResponse(422, {
          error: {
            code: 'invalid',
            message: 'Some fields of the body are not valid.',
            details: [{ path: ['scopes', 0], message: 'choose at least one scope' }],
          },
        }),
      );

      const error = await http.post('/me/tokens', {}).catch((e: unknown) => e);

      expect(error).toBeInstanceOf(ApiError);
      expect(error).toMatchObject({
        status: 422,
        code: 'invalid',
        message: 'Some fields of the body are not valid.',
        details: [{ path: ['scopes', 0], message: 'choose at least one scope' }],
      });
    });

    it('should give empty details when the error body has none', async () => {
      fetchMock.mockResolvedValue(jsonResponse(403, { error: { code: 'forbidden', message: 'Your roles do not allow this.' } }));

      const error = (await http.get('/audit').catch((e: unknown) => e)) as ApiError;

      expect(error.code).toBe('forbidden');
      expect(error.details).toEqual([]);
    });

    it('should throw a generic ApiError when the error answer is not our JSON', async () => {
      fetchMock.mockResolvedValue(new Response('<html>Bad gateway</html>', { status: 502 }));

      const error = (await http.get('/people').catch((e: unknown) => e)) as ApiError;

      expect(error).toBeInstanceOf(ApiError);
      expect(error.status).toBe(502);
      expect(error.code).toBe('unavailable');
      expect(error.message).toMatch(/HTTP 502/);
    });

    it('should throw an unavailable ApiError with status 0 when the network fails', async () => {
      fetchMock.mockRejectedValue(new TypeError('Failed to fetch'));

      const error = (await http.get('/session').catch((e: unknown) => e)) as ApiError;

      expect(error.status).toBe(0);
      expect(error.code).toBe('unavailable');
    });

    it('should tell the unauthorized hook when the session is gone', async () => {
      const onUnauthorized = vi.fn();
      configureHttpClient({ csrfToken: () => null, onUnauthorized });
      fetchMock.mockResolvedValue(jsonResponse(401, { error: { code: 'not_signed_in', message: 'You are not signed in.' } }));

      await expect(request('GET', '/me')).rejects.toBeInstanceOf(ApiError);
      expect(onUnauthorized).toHaveBeenCalledOnce();
    });

    it('should throw a malformed ApiError when a 2xx answer is not JSON', async () => {
      fetchMock.mockResolvedValue(new Response('<!doctype html>', { status: 200 }));

      await expect(http.get('/session')).rejects.toMatchObject({ code: 'malformed', status: 200 });
    });
  });

  describe('toQueryString', () => {
    it('should drop empty values and repeat keys when a value is an array', () => {
      expect(toQueryString({ a: 1, b: null, c: '', d: ['x', 'y'], e: false })).toBe('?a=1&d=x&d=y&e=false');
    });

    it('should return empty text when nothing is left', () => {
      expect(toQueryString({ a: undefined })).toBe('');
    });
  });
});
