import type { z } from 'zod';
import { detailsFromZod, ErrorBody } from '@localis/shared';
import { CliError, EXIT } from './cli-error';
import { CLI_VERSION } from './version';

const API_ROOT = '/api/v1';
/** Long enough for a busy portal, short enough that a batch job does not sit on a dead one. */
const DEFAULT_TIMEOUT_MS = 30_000;

export interface ApiClientOptions {
  /** Base address of the portal, as `normaliseUrl` returns it. */
  url: string;
  token: string;
  timeoutMs?: number;
}

export interface RequestOptions<S extends z.ZodType | undefined> {
  body?: unknown;
  /** Checks the answer, so a wrong --url (some other web server) fails here and not three calls later. */
  schema?: S;
  /** Extra request headers, e.g. `idempotency-key`; they cannot replace the token or the JSON ones. */
  headers?: Record<string, string>;
  /** Sees the headers of a successful answer, e.g. whether the portal replayed an earlier one. */
  onHeaders?: (headers: Headers) => void;
}

type Answer<S> = S extends z.ZodType ? z.infer<S> : unknown;

/** Errors of the socket layer, in the words someone on a login node would search for. */
const NETWORK_REASONS: Record<string, string> = {
  ECONNREFUSED: 'connection refused (nothing listens there; is the portal running, and is the port right?)',
  ECONNRESET: 'the connection was reset',
  ENOTFOUND: 'no such host',
  EAI_AGAIN: 'the host name could not be looked up (DNS)',
  EHOSTUNREACH: 'the host is unreachable',
  ENETUNREACH: 'the network is unreachable (compute nodes often have no outside network; use the login node)',
  ETIMEDOUT: 'the connection timed out',
  UND_ERR_CONNECT_TIMEOUT: 'the connection timed out',
  UND_ERR_SOCKET: 'the connection broke off',
  CERT_HAS_EXPIRED: 'its TLS certificate has expired',
  DEPTH_ZERO_SELF_SIGNED_CERT: 'its TLS certificate is self-signed (set NODE_EXTRA_CA_CERTS to your site CA bundle)',
  SELF_SIGNED_CERT_IN_CHAIN: 'its TLS certificate chain is not trusted (set NODE_EXTRA_CA_CERTS to your site CA bundle)',
  UNABLE_TO_VERIFY_LEAF_SIGNATURE: 'its TLS certificate is not trusted (set NODE_EXTRA_CA_CERTS to your site CA bundle)',
  ERR_TLS_CERT_ALTNAME_INVALID: 'its TLS certificate is for another host name',
  ERR_SSL_WRONG_VERSION_NUMBER: 'it does not speak TLS (try http:// instead of https://)',
};

/** Why fetch could not talk to the server, found in the cause chain undici wraps it in. */
export function describeNetworkError(error: unknown): string {
  let e: unknown = error;
  for (let depth = 0; e && depth < 5; depth++) {
    const { code, message, errors } = e as { code?: string; message?: string; errors?: unknown[] };
    if (code && NETWORK_REASONS[code]) return NETWORK_REASONS[code];
    // fetch refuses the ports of the WHATWG "bad ports" list (9, 25, 6000, …) without trying them.
    if (message === 'bad port') return 'fetch refuses to use that port (it is on the list of reserved ports); use the port the portal listens on';
    if (code) return `${message ?? code} (${code})`;
    // Happy-eyeballs connects report every address tried; the first says enough.
    if (Array.isArray(errors) && errors.length > 0) e = errors[0];
    else e = (e as { cause?: unknown }).cause;
  }
  return (error as Error)?.message ?? String(error);
}

/** The one way the CLI talks to the portal: JSON over `/api/v1` with the API token. */
export class ApiClient {
  readonly url: string;
  readonly #token: string;
  readonly #timeoutMs: number;

  constructor(opts: ApiClientOptions) {
    this.url = opts.url;
    // Private field: a client logged with console.dir or in an error report does not carry the secret.
    this.#token = opts.token;
    this.#timeoutMs = opts.timeoutMs ?? DEFAULT_TIMEOUT_MS;
  }

  get<S extends z.ZodType | undefined = undefined>(path: string, schema?: S): Promise<Answer<S>> {
    return this.request('GET', path, { schema });
  }

  post<S extends z.ZodType | undefined = undefined>(path: string, body: unknown, schema?: S, headers?: Record<string, string>): Promise<Answer<S>> {
    return this.request('POST', path, { body, schema, headers });
  }

  async request<S extends z.ZodType | undefined = undefined>(method: string, path: string, opts: RequestOptions<S> = {}): Promise<Answer<S>> {
    const endpoint = `${this.url}${API_ROOT}${path}`;
    const what = `${method} ${API_ROOT}${path}`;
    let res: Response;
    try {
      res = await fetch(endpoint, {
        method,
        headers: {
          ...opts.headers,
          authorization: `Bearer ${this.#token}`,
          accept: 'application/json',
          'user-agent': `localis-cli/${CLI_VERSION} node/${process.versions.node}`,
          ...(opts.body === undefined ? {} : { 'content-type': 'application/json' }),
        },
        body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
        signal: AbortSignal.timeout(this.#timeoutMs),
        // A redirect (typically http:// to https://) would drop or leak the Authorization header:
        // tell the person the right address instead of following it.
        redirect: 'manual',
      });
    } catch (e) {
      if ((e as Error)?.name === 'TimeoutError') {
        throw new CliError(`Localis at ${this.url} did not answer ${what} within ${Number((this.#timeoutMs / 1000).toPrecision(2))} s.`, { cause: e });
      }
      throw new CliError(`cannot reach Localis at ${this.url}: ${describeNetworkError(e)}`, {
        cause: e,
        hint: 'Check the address (--url, LOCALIS_URL or the stored profile).',
      });
    }

    if (res.status >= 300 && res.status < 400) {
      const location = res.headers.get('location');
      throw new CliError(`${this.url} redirects ${what} to ${location ?? 'another address'}.`, {
        hint: 'Give the address the portal redirects to with --url (or LOCALIS_URL).',
      });
    }

    const text = await res.text();
    const json = parseJson(text);

    if (!res.ok) {
      const exitCode = res.status === 401 ? EXIT.notSignedIn : EXIT.failed;
      const body = ErrorBody.safeParse(json);
      if (body.success) {
        throw new CliError(body.data.error.message, { exitCode, details: body.data.error.details });
      }
      throw new CliError(`${this.url} answered ${what} with ${res.status} ${res.statusText}; is that the Localis portal?`, { exitCode });
    }

    opts.onHeaders?.(res.headers);
    if (res.status === 204 || text === '') return undefined as Answer<S>;
    if (json === NOT_JSON) {
      throw new CliError(`${this.url} answered ${what} with something other than JSON; is that the Localis portal?`);
    }
    if (!opts.schema) return json as Answer<S>;
    const parsed = opts.schema.safeParse(json);
    if (!parsed.success) {
      throw new CliError(`the answer of ${this.url} to ${what} is not what this CLI expects; update the CLI or check --url.`, {
        details: detailsFromZod(parsed.error),
      });
    }
    return parsed.data as Answer<S>;
  }
}

const NOT_JSON = Symbol('not JSON');

function parseJson(text: string): unknown {
  if (text === '') return NOT_JSON;
  try {
    return JSON.parse(text);
  } catch {
    return NOT_JSON;
  }
}
