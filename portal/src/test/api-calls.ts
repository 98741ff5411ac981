import { afterEach, beforeEach, vi } from 'vitest';
import { configureHttpClient } from '../api/http-client';
import { jsonResponse } from './fetch-stub';

/** The CSRF token the client sends on writes during a test; the tests expect it by value. */
const CSRF_TOKEN = 'csrf-123';

/** One request as an api module sent it: what a test of the module's routes compares. */
export interface SentCall {
  url: string;
  method: string | undefined;
  /** The JSON body, read back; undefined when none was sent. */
  body: unknown;
  csrf: string | undefined;
}

/**
 * For the tests of an api module, inside its `describe`: every fetch answers 200 with
 * `defaultAnswer` (a test can queue others with `fetchMock.mockResolvedValueOnce`), writes carry
 * the CSRF token 'csrf-123', and both are undone after each test.
 */
export function recordApiCalls(defaultAnswer: unknown = {}) {
  // One mock for the whole suite, reset before each test, so the returned handle stays valid.
  const fetchMock = vi.fn<(url: string, init?: RequestInit) => Promise<Response>>();

  beforeEach(() => {
    fetchMock.mockReset();
    fetchMock.mockImplementation(() => Promise.resolve(jsonResponse(200, defaultAnswer)));
    vi.stubGlobal('fetch', fetchMock);
    configureHttpClient({ csrfToken: () => CSRF_TOKEN });
  });

  afterEach(() => {
    vi.unstubAllGlobals();
    configureHttpClient({ csrfToken: () => null });
  });

  /** The options of the i-th request, as given to fetch (its signal, headers, body). */
  const init = (i = 0): RequestInit & { headers: Record<string, string> } => {
    const sent = fetchMock.mock.calls[i];
    if (!sent) throw new Error(`no request number ${i} was sent (${fetchMock.mock.calls.length} were)`);
    return sent[1] as RequestInit & { headers: Record<string, string> };
  };

  /** The i-th request: address, method, JSON body and CSRF header. */
  const call = (i = 0): SentCall => {
    const options = init(i);
    return {
      url: fetchMock.mock.calls[i][0],
      method: options.method,
      body: options.body ? JSON.parse(String(options.body)) : undefined,
      csrf: options.headers['x-csrf-token'],
    };
  };

  return { fetchMock, call, init };
}
