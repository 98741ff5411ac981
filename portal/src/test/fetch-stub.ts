import { vi } from 'vitest';

/** An answer of the api: a JSON body with its status. */
export function jsonResponse(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });
}

/** The api's 404 for an address a test does not serve; it names the address, so a failure says which. */
export function notServed(url: string): Response {
  return jsonResponse(404, { error: { code: 'not_found', message: `no ${url}` } });
}

/** The api for a test: every fetch is answered by `serve`. The mock keeps the calls. */
export function stubFetch(serve: (url: string, init?: RequestInit) => Response) {
  const fetchMock = vi.fn((url: string, init?: RequestInit) => Promise.resolve(serve(url, init)));
  vi.stubGlobal('fetch', fetchMock);
  return fetchMock;
}
