import { ErrorBody } from '@localis/shared';
import { ApiError, codeForStatus } from './api-error';

export const API_BASE = '/api/v1';

export type QueryValue = string | number | boolean | null | undefined;
export type QueryParams = Record<string, QueryValue | QueryValue[]>;

export interface RequestOptions {
  query?: QueryParams;
  body?: unknown;
  signal?: AbortSignal;
}

export interface HttpClientHooks {
  /** The CSRF token sent on every request that changes something. */
  csrfToken: () => string | null | undefined;
  /** Told when the server says the session is gone, so the app can send the person to sign in. */
  onUnauthorized?: (error: ApiError) => void;
}

let hooks: HttpClientHooks = { csrfToken: () => null };

/** Wired once in main.ts; the client itself knows nothing of stores or the router. */
export function configureHttpClient(next: HttpClientHooks): void {
  hooks = next;
}

/** `?a=1&b=x` without empty values; arrays repeat the key. Returns '' when nothing is left. */
export function toQueryString(query: QueryParams = {}): string {
  const params = new URLSearchParams();
  for (const [key, raw] of Object.entries(query)) {
    const values = Array.isArray(raw) ? raw : [raw];
    for (const value of values) {
      if (value === undefined || value === null || value === '') continue;
      params.append(key, String(value));
    }
  }
  const text = params.toString();
  return text ? `?${text}` : '';
}

/** The address of an API resource, for links such as CSV downloads. */
export function apiUrl(path: string, query?: QueryParams): string {
  return `${API_BASE}${path}${toQueryString(query)}`;
}

const NETWORK_MESSAGE = 'Localis cannot reach its server. Check your connection and try again.';

async function readError(response: Response): Promise<ApiError> {
  let body: unknown = null;
  try {
    body = await response.json();
  } catch {
    // Not JSON: a proxy's error page or an empty body. Fall through to a generic message.
  }
  const parsed = ErrorBody.safeParse(body);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    return new ApiError(response.status, code, message, details ?? []);
  }
  const code = codeForStatus(response.status);
  const message =
    response.status >= 500
      ? `The server could not answer (HTTP ${response.status}). Try again in a moment.`
      : `The request was refused (HTTP ${response.status}).`;
  return new ApiError(response.status, code, message);
}

export async function request<T>(method: string, path: string, options: RequestOptions = {}): Promise<T> {
  const headers: Record<string, string> = { accept: 'application/json' };
  if (options.body !== undefined) headers['content-type'] = 'application/json';
  if (method !== 'GET' && method !== 'HEAD') {
    const token = hooks.csrfToken();
    if (token) headers['x-csrf-token'] = token;
  }

  let response: Response;
  try {
    response = await fetch(apiUrl(path, options.query), {
      method,
      headers,
      credentials: 'same-origin',
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
      signal: options.signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError(0, 'unavailable', NETWORK_MESSAGE);
  }

  if (!response.ok) {
    const error = await readError(response);
    if (error.code === 'not_signed_in') hooks.onUnauthorized?.(error);
    throw error;
  }
  if (response.status === 204) return undefined as T;
  try {
    return (await response.json()) as T;
  } catch (cause) {
    // A newer request may abort this one while its body is still being read: not a bad answer.
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError(response.status, 'malformed', 'The server sent an answer Localis could not read.');
  }
}

export const http = {
  get: <T>(path: string, query?: QueryParams, signal?: AbortSignal) => request<T>('GET', path, { query, signal }),
  post: <T>(path: string, body?: unknown) => request<T>('POST', path, { body }),
  put: <T>(path: string, body?: unknown) => request<T>('PUT', path, { body }),
  patch: <T>(path: string, body?: unknown) => request<T>('PATCH', path, { body }),
  delete: <T = void>(path: string) => request<T>('DELETE', path),
};
