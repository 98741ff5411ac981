import { randomUUID } from 'node:crypto';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { balancesOf, detailsFromZod, fromMilli, judgeDebit, runMilliCoreHours, RunInput, toMilli, type LedgerAmount, type Run } from '@localis/shared';

export const FAKE_TOKEN = 'lcs_fakeportaltokenfakeportaltoken';

export interface SeenRequest {
  method: string;
  path: string;
  idempotencyKey?: string;
  body?: unknown;
}

/** An answer to give instead of the fake's own, for the next request to a path. */
export interface ScriptedAnswer {
  status: number;
  body: unknown;
}

/**
 * A stand-in for the runs part of the portal's api on loopback, for the CLI's tests while the
 * real routes are not served by the test stack: it checks the token, validates with the same
 * schema, charges a 10 000 core-hour grant, refuses duplicates and overdrafts, and replays the
 * first answer for an Idempotency-Key it has seen, as the contract says the api does.
 */
export class FakeRunsPortal {
  readonly campaignId = randomUUID();
  readonly grantMilli = 10_000_000;
  readonly requests: SeenRequest[] = [];
  readonly runs: Run[] = [];
  readonly #answersByKey = new Map<string, { request: string; status: number; body: unknown }>();
  readonly #scripted = new Map<string, ScriptedAnswer>();
  readonly #server = createServer((req, res) => void this.#handle(req, res));
  url = '';

  async start(): Promise<this> {
    await new Promise<void>((done) => this.#server.listen(0, '127.0.0.1', done));
    this.url = `http://127.0.0.1:${(this.#server.address() as AddressInfo).port}`;
    return this;
  }

  async stop(): Promise<void> {
    this.#server.closeAllConnections();
    await new Promise((done) => this.#server.close(done));
  }

  /** Answer the next request to `METHOD /path` (query left out) with this instead. */
  script(methodAndPath: string, answer: ScriptedAnswer): void {
    this.#scripted.set(methodAndPath, answer);
  }

  /** Runs recorded directly, as if by the portal or an import, to fill the list. */
  seed(count: number): void {
    for (let i = 0; i < count; i++) {
      const startedAt = new Date(Date.UTC(2027, 1, 1, 0, 0, 0) + i * 3_600_000).toISOString();
      this.#record({
        externalJobId: String(9000 + i),
        machine: 'cluster-a',
        startedAt,
        endedAt: new Date(new Date(startedAt).getTime() + 1_800_000).toISOString(),
        cores: 2,
        codeName: 'tmm',
        codeVersion: '1.4.2',
        parameters: { sizes: [], disorder: [], energies: [], seeds: [] },
      });
    }
  }

  get balances() {
    const entries: LedgerAmount[] = [{ kind: 'grant', milli: this.grantMilli }, ...this.runs.map((r): LedgerAmount => ({ kind: 'debit', milli: -toMilli(r.coreHours) }))];
    return balancesOf(entries);
  }

  #record(input: RunInput): Run {
    const run: Run = {
      ...input,
      id: randomUUID(),
      campaignId: this.campaignId,
      coreHours: input.coreHours ?? fromMilli(runMilliCoreHours(input.cores, input.startedAt, input.endedAt)),
      refundedCoreHours: 0,
      source: 'api',
      recordedByName: 'Ines Albrecht',
      createdAt: new Date().toISOString(),
    };
    this.runs.push(run);
    return run;
  }

  async #handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
    let text = '';
    for await (const chunk of req) text += String(chunk);
    const url = new URL(req.url ?? '/', this.url);
    const key = req.headers['idempotency-key'] as string | undefined;
    this.requests.push({ method: req.method ?? '', path: url.pathname + url.search, idempotencyKey: key, body: text ? JSON.parse(text) : undefined });
    const send = (status: number, body: unknown) => {
      res.statusCode = status;
      res.setHeader('content-type', 'application/json');
      res.end(JSON.stringify(body));
    };
    const fail = (status: number, code: string, message: string, details?: unknown) => send(status, { error: { code, message, ...(details ? { details } : {}) } });

    if (req.headers.authorization !== `Bearer ${FAKE_TOKEN}`) return fail(401, 'token_invalid', 'This API token is not known.');
    const scripted = this.#scripted.get(`${req.method} ${url.pathname}`);
    if (scripted) {
      this.#scripted.delete(`${req.method} ${url.pathname}`);
      return send(scripted.status, scripted.body);
    }
    const base = `/api/v1/campaigns/${this.campaignId}`;
    if (!url.pathname.startsWith(base)) return fail(404, 'not_found', 'The campaign was not found.');
    const route = `${req.method} ${url.pathname.slice(base.length)}`;

    if (route === 'POST /runs') {
      if (key && this.#answersByKey.has(key)) {
        const first = this.#answersByKey.get(key)!;
        if (first.request !== text) {
          return fail(409, 'conflict', 'This Idempotency-Key was used for a different request. Use a new key for a new request; reuse a key only to retry the same one.');
        }
        res.setHeader('idempotent-replayed', 'true');
        return send(first.status, first.body);
      }
      const answer = this.#addRun(JSON.parse(text || 'null'));
      if (key) this.#answersByKey.set(key, { request: text, ...answer });
      return send(answer.status, answer.body);
    }
    if (route === 'GET /ledger') {
      const b = this.balances;
      return send(200, {
        campaignId: this.campaignId,
        granted: fromMilli(b.granted),
        used: fromMilli(b.used),
        expired: fromMilli(b.expired),
        remaining: fromMilli(b.remaining),
        overdraftPercent: 0,
        overdraftAllowance: 0,
        alerted: [],
        entries: [],
      });
    }
    if (route === 'GET /runs') {
      const limit = Number(url.searchParams.get('limit') ?? 25);
      const offset = Number(url.searchParams.get('offset') ?? 0);
      const sorted = [...this.runs].sort((a, b) => b.startedAt.localeCompare(a.startedAt));
      return send(200, { items: sorted.slice(offset, offset + limit), total: sorted.length, limit, offset });
    }
    return fail(404, 'not_found', `There is no ${req.method} ${url.pathname} in the Localis API; /api/v1/openapi.json lists the routes.`);
  }

  #addRun(body: unknown): { status: number; body: unknown } {
    const parsed = RunInput.safeParse(body);
    if (!parsed.success) return { status: 422, body: { error: { code: 'invalid', message: 'Some fields of the body are not valid.', details: detailsFromZod(parsed.error) } } };
    const input = parsed.data;
    if (this.runs.some((r) => r.externalJobId === input.externalJobId && r.machine === input.machine)) {
      return { status: 409, body: { error: { code: 'conflict', message: `Job ${input.externalJobId} is already recorded on ${input.machine}.` } } };
    }
    const debit = input.coreHours === undefined ? runMilliCoreHours(input.cores, input.startedAt, input.endedAt) : toMilli(input.coreHours);
    const verdict = judgeDebit(this.balances, debit, 0);
    if (!verdict.allowed) {
      return { status: 409, body: { error: { code: 'conflict', message: `This run needs ${fromMilli(debit)} core-hours; the campaign has ${fromMilli(this.balances.remaining)} left.` } } };
    }
    return { status: 201, body: this.#record(input) };
  }
}
