import { createServer, type RequestListener, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterEach, describe, expect, it } from 'vitest';
import { Profile } from '@localis/shared';
import { ApiClient, describeNetworkError } from './api-client';
import { demoToken, RESEARCHER } from '../../test/cli-harness';
import { failure } from '../../test/cli-error-of';

/** A real HTTP server standing in for whatever a wrong --url points at (a proxy, some other site). */
let server: Server | undefined;
async function serve(handler: RequestListener): Promise<string> {
  server = createServer(handler);
  await new Promise<void>((done) => server!.listen(0, '127.0.0.1', done));
  return `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
}
afterEach(async () => {
  server?.closeAllConnections();
  await new Promise((done) => (server ? server.close(done) : done(undefined)));
  server = undefined;
});

/** A port that was just free: nothing listens there, so connecting is refused. */
async function closedPort(): Promise<number> {
  const s = createServer();
  await new Promise<void>((done) => s.listen(0, '127.0.0.1', done));
  const { port } = s.address() as AddressInfo;
  await new Promise((done) => s.close(done));
  return port;
}

describe('ApiClient', () => {
  describe('requests', () => {
    it('should send the bearer token and ask for JSON under /api/v1 when calling a path', async () => {
      let seen: { url?: string; auth?: string; accept?: string; agent?: string } = {};
      const url = await serve((req, res) => {
        seen = { url: req.url, auth: req.headers.authorization, accept: req.headers.accept, agent: req.headers['user-agent'] };
        res.setHeader('content-type', 'application/json').end('{"ok":true}');
      });
      expect(await new ApiClient({ url, token: 'lcs_abc' }).get('/me')).toEqual({ ok: true });
      expect(seen).toMatchObject({ url: '/api/v1/me', auth: 'Bearer lcs_abc', accept: 'application/json' });
      expect(seen.agent).toMatch(/^localis-cli\/\d+\.\d+\.\d+ node\//);
    });

    it('should send extra headers with a write, keep its own token over one named authorization, and show the answer headers', async () => {
      let seen: { key?: string; auth?: string; type?: string; body?: string } = {};
      const url = await serve((req, res) => {
        let body = '';
        req.on('data', (chunk: Buffer) => (body += chunk.toString()));
        req.on('end', () => {
          seen = { key: req.headers['idempotency-key'] as string, auth: req.headers.authorization, type: req.headers['content-type'], body };
          res.statusCode = 201;
          res.setHeader('idempotent-replayed', 'true');
          res.setHeader('content-type', 'application/json').end('{"id":"r1"}');
        });
      });
      let replayed: string | null = null;
      const answer = await new ApiClient({ url, token: 'lcs_abc' }).request('POST', '/campaigns/c/runs', {
        body: { cores: 4 },
        headers: { 'idempotency-key': 'run-1', authorization: 'Bearer other' },
        onHeaders: (h) => (replayed = h.get('idempotent-replayed')),
      });
      expect(answer).toEqual({ id: 'r1' });
      expect(replayed).toBe('true');
      expect(seen).toEqual({ key: 'run-1', auth: 'Bearer lcs_abc', type: 'application/json', body: '{"cores":4}' });
    });

    it('should not expose the token when the client is inspected or serialised', () => {
      const client = new ApiClient({ url: 'http://127.0.0.1:1', token: 'lcs_secretsecretsecret' });
      expect(JSON.stringify(client)).not.toContain('lcs_secret');
      expect(Object.values(client)).not.toContain('lcs_secretsecretsecret');
    });
  });

  describe('error answers', () => {
    it('should throw the server message with details as path lines when the body is a Localis error', async () => {
      const url = await serve((_req, res) => {
        res.statusCode = 422;
        res.setHeader('content-type', 'application/json');
        res.end(JSON.stringify({ error: { code: 'invalid', message: 'Some fields of the body are not valid.', details: [{ path: ['scopes'], message: 'choose at least one scope' }] } }));
      });
      const e = await failure(new ApiClient({ url, token: 't' }).post('/me/tokens', {}));
      expect(e.message).toBe('Some fields of the body are not valid.');
      expect(e.details).toEqual([{ path: ['scopes'], message: 'choose at least one scope' }]);
      expect(e.exitCode).toBe(1);
    });

    it('should use exit code 3 when the server answers 401', async () => {
      const url = await serve((_req, res) => {
        res.statusCode = 401;
        res.end(JSON.stringify({ error: { code: 'token_invalid', message: 'This API token expired on 2026-01-01.' } }));
      });
      const e = await failure(new ApiClient({ url, token: 't' }).get('/me'));
      expect(e).toMatchObject({ message: 'This API token expired on 2026-01-01.', exitCode: 3 });
    });

    it('should name the status and ask whether it is the portal when the error body is not a Localis one', async () => {
      const url = await serve((_req, res) => {
        res.statusCode = 502;
        res.statusMessage = 'Bad Gateway';
        res.end('<html>proxy error</html>');
      });
      const e = await failure(new ApiClient({ url, token: 't' }).get('/me'));
      expect(e.message).toBe(`${url} answered GET /api/v1/me with 502 Bad Gateway; is that the Localis portal?`);
    });

    it('should refuse an answer that is not JSON when the request succeeded', async () => {
      const url = await serve((_req, res) => res.end('<!doctype html><title>Login</title>'));
      const e = await failure(new ApiClient({ url, token: 't' }).get('/me'));
      expect(e.message).toMatch(/something other than JSON; is that the Localis portal\?/);
    });

    it('should list what is wrong when the answer does not match the schema', async () => {
      const url = await serve((_req, res) => res.end(JSON.stringify({ person: { name: 'x' }, groups: [] })));
      const e = await failure(new ApiClient({ url, token: 't' }).get('/me', Profile));
      expect(e.message).toMatch(/is not what this CLI expects/);
      expect(e.details.map((d) => d.path.join('.'))).toContain('person.email');
    });

    it('should tell the address to use instead of following a redirect', async () => {
      const url = await serve((_req, res) => {
        res.statusCode = 301;
        res.setHeader('location', 'https://localis.example.org/api/v1/me');
        res.end();
      });
      const e = await failure(new ApiClient({ url, token: 't' }).get('/me'));
      expect(e.message).toBe(`${url} redirects GET /api/v1/me to https://localis.example.org/api/v1/me.`);
      expect(e.hint).toMatch(/--url/);
    });
  });

  describe('network failures', () => {
    it('should say connection refused and name the URL when nothing listens', async () => {
      const url = `http://127.0.0.1:${await closedPort()}`;
      const e = await failure(new ApiClient({ url, token: 't' }).get('/me'));
      expect(e.message).toMatch(new RegExp(`^cannot reach Localis at ${url}: connection refused`));
      expect(e.exitCode).toBe(1);
    });

    it('should explain a reserved port when the URL uses one fetch refuses, such as 9', async () => {
      const e = await failure(new ApiClient({ url: 'http://127.0.0.1:9', token: 't' }).get('/me'));
      expect(e.message).toMatch(/^cannot reach Localis at http:\/\/127\.0\.0\.1:9: fetch refuses to use that port/);
    });

    it('should give up with the time waited when the server does not answer', async () => {
      const url = await serve(() => {
        /* never answers */
      });
      const e = await failure(new ApiClient({ url, token: 't', timeoutMs: 300 }).get('/me'));
      expect(e.message).toBe(`Localis at ${url} did not answer GET /api/v1/me within 0.3 s.`);
    });

    it('should find the socket error code when undici wraps it in causes', () => {
      const wrapped = new TypeError('fetch failed', { cause: Object.assign(new Error('getaddrinfo ENOTFOUND x'), { code: 'ENOTFOUND' }) });
      expect(describeNetworkError(wrapped)).toBe('no such host');
      const aggregate = new TypeError('fetch failed', { cause: new AggregateError([Object.assign(new Error('x'), { code: 'ENETUNREACH' })]) });
      expect(describeNetworkError(aggregate)).toMatch(/^the network is unreachable/);
      const unknown = new TypeError('fetch failed', { cause: Object.assign(new Error('odd thing'), { code: 'EODD' }) });
      expect(describeNetworkError(unknown)).toBe('odd thing (EODD)');
    });
  });

  describe.skipIf(!process.env.PUBLIC_URL)('against the running api', () => {
    const url = process.env.PUBLIC_URL!;

    it('should return the validated profile when the token is a demo token', async () => {
      const me = await new ApiClient({ url, token: demoToken(RESEARCHER) }).get('/me', Profile);
      expect(me.person).toMatchObject({ name: 'Ines Albrecht', email: RESEARCHER, institutionName: 'Brennmoor Institute of Lattice Physics' });
    });

    it('should carry the server message and exit code 3 when the token is unknown', async () => {
      const e = await failure(new ApiClient({ url, token: 'lcs_unknownunknownunknownunknown' }).get('/me'));
      expect(e.exitCode).toBe(3);
      expect(e.message).toMatch(/This API token is not known/);
    });

    it('should carry the server message when the route does not exist', async () => {
      const e = await failure(new ApiClient({ url, token: demoToken(RESEARCHER) }).get('/no-such-thing'));
      expect(e.exitCode).toBe(1);
      expect(e.message).toMatch(/There is no GET \/api\/v1\/no-such-thing in the Localis API/);
    });
  });
});
