import { createHash, generateKeyPairSync, randomUUID, type KeyObject } from 'node:crypto';
import { createReadStream, mkdtempSync, rmSync } from 'node:fs';
import { writeFile } from 'node:fs/promises';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  canonicalJson,
  formatOfFileName,
  partRange,
  planParts,
  type Archive,
  type ArchiveProblem,
  type ArchiveState,
  type ProvenanceRecord,
  type SignedTreeHead,
} from '@localis/shared';
import { consistencyProof, inclusionProof, keyIdOf, leafHash, merkleRoot, publicKeyPemOf, signTreeHead } from '@localis/shared/node';

/**
 * A small stand-in for the portal's archive and provenance endpoints and for the object store's
 * presigned part PUTs, in the test's own process: the upload, resume, retry and log checks can be
 * tested (and the real `localis` run against it) without the test stack. Parts are kept on disk,
 * so a 1 GiB upload costs the test no memory. It follows the api's contract (archives.service.ts,
 * provenance.service.ts), not its every rule: no campaigns, people or database.
 */

export interface FakePortalOptions {
  token?: string;
  /** Ms between `received` and `checking`, and between `checking` and the outcome. */
  checkDelayMs?: number;
  /** Problems the "worker" finds in every archive (none: verified when the checksum matches). */
  problems?: ArchiveProblem[];
}

interface FakeArchive {
  dto: Archive;
  parts: Map<number, { sizeBytes: number; path: string }>;
}

export interface PutRecord {
  archiveId: string;
  partNumber: number;
  status: number;
  bytes: number;
}

export interface FakePortal {
  url: string;
  token: string;
  archives: Map<string, FakeArchive>;
  /** Every PUT the store answered (or that was cut off: status 0). */
  puts: PutRecord[];
  /** Requests to the api, as `METHOD /path`. */
  calls: string[];
  /** Answer the next `times` PUTs of a part with this status instead of storing them. */
  failPut(partNumber: number, times: number, status: number): void;
  /** Make every address handed out so far refuse with 403, as an expired presigned URL does. */
  expireUrls(): void;
  /** Hold every PUT this many ms before reading its body (to interrupt an upload midway). */
  slowPutsMs: number;
  /** Replace the signing key (a portal that changed its key). */
  rotateKey(): void;
  /** Append a record that is not an archive's (to grow the log). */
  appendRecord(kind?: ProvenanceRecord['kind']): void;
  close(): Promise<void>;
}

const API = '/api/v1';

function send(res: ServerResponse, status: number, body: unknown): void {
  const text = JSON.stringify(body);
  res.writeHead(status, { 'content-type': 'application/json', 'content-length': Buffer.byteLength(text) });
  res.end(text);
}
const notFound = (res: ServerResponse, what: string) => send(res, 404, { error: { code: 'not_found', message: `${what} was not found.` } });
const conflict = (res: ServerResponse, message: string) => send(res, 409, { error: { code: 'conflict', message } });

async function readJson(req: IncomingMessage): Promise<Record<string, unknown>> {
  let text = '';
  for await (const chunk of req) text += (chunk as Buffer).toString('utf8');
  return text ? (JSON.parse(text) as Record<string, unknown>) : {};
}

export async function startFakePortal(options: FakePortalOptions = {}): Promise<FakePortal> {
  const token = options.token ?? 'lcs_fakeportaltokenfakeportaltoken';
  const dir = mkdtempSync(join(tmpdir(), 'localis-fake-store-'));
  const archives = new Map<string, FakeArchive>();
  const puts: PutRecord[] = [];
  const calls: string[] = [];
  const failures = new Map<number, { times: number; status: number }>();
  let urlGeneration = 0;
  let validFrom = 0;
  let key: KeyObject = generateKeyPairSync('ed25519').privateKey;
  const leaves: Buffer[] = [];
  const entries: { leafIndex: number; content: string; leafHash: string; createdAt: string; sha256: string | null; campaignId: string; subjectId: string; record: ProvenanceRecord }[] = [];
  const heads = new Map<number, SignedTreeHead>();
  /** Checks still running: closing waits for them, so none reads a part file after it is gone. */
  const checking = new Set<Promise<void>>();

  const headOf = (size: number): SignedTreeHead => {
    const known = heads.get(size);
    if (known) return known;
    const head = signTreeHead(key, { treeSize: size, rootHash: merkleRoot(leaves, size).toString('hex'), timestamp: new Date().toISOString() });
    heads.set(size, head);
    return head;
  };
  const append = (record: ProvenanceRecord, sha256: string | null, subjectId: string) => {
    const content = canonicalJson(record);
    const hash = leafHash(content);
    leaves.push(hash);
    entries.push({ leafIndex: leaves.length - 1, content, leafHash: hash.toString('hex'), createdAt: new Date().toISOString(), sha256, campaignId: record.campaignId, subjectId, record });
  };
  const recordOf = (kind: ProvenanceRecord['kind'], campaignId: string, attributes: Record<string, string | number>, id: string): ProvenanceRecord => ({
    v: 1,
    kind,
    campaignId,
    at: new Date().toISOString(),
    entities: [{ id: `localis:archive/${id}`, label: 'fake', attributes }],
    activities: [],
    agents: [],
    used: [],
    wasGeneratedBy: [],
    wasAssociatedWith: [],
    wasDerivedFrom: [],
  });

  const fake: FakePortal = {
    url: '',
    token,
    archives,
    puts,
    calls,
    slowPutsMs: 0,
    failPut(partNumber, times, status) {
      failures.set(partNumber, { times, status });
    },
    expireUrls() {
      validFrom = ++urlGeneration;
    },
    rotateKey() {
      key = generateKeyPairSync('ed25519').privateKey;
      heads.clear();
    },
    appendRecord(kind = 'run-recorded') {
      append(recordOf(kind, '3f1c9a52-7d4e-4b8a-9c61-2e5f0a7b8d90', {}, randomUUID()), null, randomUUID());
    },
    close: async () => {
      await Promise.allSettled([...checking]);
      await new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => {
          rmSync(dir, { recursive: true, force: true });
          resolve();
        });
      });
    },
  };

  const setState = (a: FakeArchive, state: ArchiveState, extra: Partial<Archive> = {}) => {
    a.dto = { ...a.dto, state, ...extra };
  };

  async function sha256Of(a: FakeArchive): Promise<string> {
    const hash = createHash('sha256');
    for (let n = 1; n <= a.dto.partCount; n++) {
      for await (const chunk of createReadStream(a.parts.get(n)!.path)) hash.update(chunk as Buffer);
    }
    return hash.digest('hex');
  }

  async function check(a: FakeArchive, declared: string): Promise<void> {
    const delay = options.checkDelayMs ?? 50;
    await new Promise((r) => setTimeout(r, delay));
    setState(a, 'checking');
    const actual = await sha256Of(a);
    await new Promise((r) => setTimeout(r, delay));
    const problems: ArchiveProblem[] = [...(options.problems ?? [])];
    if (actual !== declared) problems.push({ code: 'checksum-mismatch', message: `the file's SHA-256 is ${actual}; the upload declared ${declared}` });
    const now = new Date().toISOString();
    if (problems.length) return setState(a, 'rejected', { problems, checkedAt: now });
    append(recordOf('archive-verified', a.dto.campaignId, { sha256: declared, sizeBytes: a.dto.sizeBytes }, a.dto.id), declared, a.dto.id);
    setState(a, 'verified', { checkedAt: now, provenanceEntryId: String(entries.length - 1) });
  }

  async function api(req: IncomingMessage, res: ServerResponse, path: string, query: URLSearchParams): Promise<void> {
    calls.push(`${req.method} ${path}`);
    if (req.headers.authorization !== `Bearer ${token}`) return send(res, 401, { error: { code: 'unauthorized', message: 'This API token is not known.' } });
    let m: RegExpExecArray | null;
    if (req.method === 'POST' && (m = /^\/campaigns\/([^/]+)\/archives$/.exec(path))) {
      const body = await readJson(req);
      const sizeBytes = Number(body.sizeBytes);
      const format = formatOfFileName(String(body.fileName));
      if (!format || !(sizeBytes > 0)) return send(res, 422, { error: { code: 'invalid', message: 'Some fields of the request are not valid.' } });
      const { partSizeBytes, partCount } = planParts(sizeBytes);
      const id = randomUUID();
      const dto: Archive = {
        id,
        campaignId: m[1],
        kind: (body.kind as Archive['kind']) ?? 'results',
        fileName: String(body.fileName),
        format,
        sizeBytes,
        partSizeBytes,
        partCount,
        declaredSha256: null,
        state: 'uploading',
        problems: [],
        runIds: (body.runIds as string[]) ?? [],
        manifest: null,
        uploadedByName: 'Fake Person',
        createdAt: new Date().toISOString(),
        receivedAt: null,
        checkedAt: null,
        withdrawnAt: null,
        withdrawnReason: null,
        withdrawnByName: null,
        provenanceEntryId: null,
      };
      archives.set(id, { dto, parts: new Map() });
      return send(res, 201, { archive: dto, partSizeBytes, partCount });
    }
    if ((m = /^\/archives\/([^/]+)(\/[a-z-]+)?$/.exec(path))) {
      const a = archives.get(m[1]);
      if (!a) return notFound(res, 'The archive');
      const sub = m[2] ?? '';
      if (req.method === 'GET' && sub === '') return send(res, 200, a.dto);
      if (req.method === 'GET' && sub === '/parts') {
        const parts = a.dto.state === 'uploading' ? [...a.parts].map(([partNumber, p]) => ({ partNumber, sizeBytes: p.sizeBytes })).sort((x, y) => x.partNumber - y.partNumber) : [];
        return send(res, 200, { parts });
      }
      if (req.method === 'POST' && sub === '/part-urls') {
        const { partNumbers } = (await readJson(req)) as { partNumbers: number[] };
        if (a.dto.state !== 'uploading') return conflict(res, `${a.dto.fileName} is uploaded already (${a.dto.state}); its parts can no longer be sent.`);
        const expiresAt = new Date(Date.now() + 15 * 60_000).toISOString();
        const urls = [...new Set(partNumbers)].map((n) => ({ partNumber: n, url: `${fake.url}/store/${a.dto.id}/${n}?generation=${urlGeneration}`, expiresAt }));
        return send(res, 200, { urls });
      }
      if (req.method === 'POST' && sub === '/complete') {
        const { sha256 } = (await readJson(req)) as { sha256: string };
        if (a.dto.state !== 'uploading') {
          if (a.dto.declaredSha256 === sha256) return send(res, 200, a.dto);
          return conflict(res, `${a.dto.fileName} was completed already with another SHA-256.`);
        }
        const missing: number[] = [];
        for (let n = 1; n <= a.dto.partCount; n++) {
          const { start, end } = partRange(n, a.dto.partSizeBytes, a.dto.sizeBytes);
          if (a.parts.get(n)?.sizeBytes !== end - start) missing.push(n);
        }
        if (missing.length) return conflict(res, `${a.dto.fileName} cannot be completed yet: ${missing.length} of ${a.dto.partCount} parts are not stored yet (${missing.join(', ')}). Send the missing parts and complete again.`);
        setState(a, 'received', { declaredSha256: sha256, receivedAt: new Date().toISOString() });
        const running: Promise<void> = check(a, sha256)
          .catch(() => undefined)
          .finally(() => checking.delete(running));
        checking.add(running);
        return send(res, 200, a.dto);
      }
    }
    if (req.method === 'GET' && path === '/provenance/key') return send(res, 200, { keyId: keyIdOf(key), algorithm: 'Ed25519', publicKeyPem: publicKeyPemOf(key) });
    if (req.method === 'GET' && path === '/provenance/head') return send(res, 200, headOf(leaves.length));
    if (req.method === 'GET' && (m = /^\/provenance\/archives\/([0-9a-f]{64})$/.exec(path))) {
      const entry = [...entries].reverse().find((e) => e.sha256 === m![1]);
      if (!entry) return notFound(res, 'A verified archive with this SHA-256 in the provenance log');
      const head = headOf(leaves.length);
      const { sha256: _sha, ...dto } = entry;
      const proof = { leafIndex: entry.leafIndex, treeSize: head.treeSize, leafHash: entry.leafHash, auditPath: inclusionProof(entry.leafIndex, leaves, head.treeSize).map((h) => h.toString('hex')), head };
      return send(res, 200, { entry: { id: String(entry.leafIndex), kind: entry.record.kind, ...dto }, proof });
    }
    if (req.method === 'GET' && path === '/provenance/consistency') {
      const from = Number(query.get('from'));
      const to = query.has('to') ? Number(query.get('to')) : leaves.length;
      if (!heads.has(from) && from !== to) return notFound(res, `A signed tree head of size ${from}`);
      const path_ = from === to ? [] : consistencyProof(from, leaves, to).map((h) => h.toString('hex'));
      return send(res, 200, { firstSize: from, secondSize: to, path: path_, first: headOf(from), second: headOf(to) });
    }
    return notFound(res, `${req.method} ${path}`);
  }

  async function store(req: IncomingMessage, res: ServerResponse, archiveId: string, partNumber: number, generation: number): Promise<void> {
    const a = archives.get(archiveId);
    const length = Number(req.headers['content-length']);
    const record: PutRecord = { archiveId, partNumber, status: 0, bytes: 0 };
    puts.push(record);
    const refuse = (status: number, code: string) => {
      record.status = status;
      req.resume();
      res.writeHead(status, { 'content-type': 'application/xml' });
      res.end(`<?xml version="1.0" encoding="UTF-8"?><Error><Code>${code}</Code><Message>refused by the fake store</Message></Error>`);
    };
    if (!a || a.dto.state !== 'uploading') return refuse(404, 'NoSuchUpload');
    if (generation < validFrom) return refuse(403, 'AccessDenied');
    const failure = failures.get(partNumber);
    if (failure && failure.times > 0) {
      failure.times -= 1;
      return refuse(failure.status, failure.status === 403 ? 'AccessDenied' : 'InternalError');
    }
    if (!Number.isInteger(length)) return refuse(411, 'MissingContentLength');
    if (fake.slowPutsMs) await new Promise((r) => setTimeout(r, fake.slowPutsMs));
    const chunks: Buffer[] = [];
    let received = 0;
    try {
      for await (const chunk of req) {
        chunks.push(chunk as Buffer);
        received += (chunk as Buffer).length;
      }
    } catch {
      return; // cut off: nothing is stored, as S3 stores no half part
    }
    if (received !== length) return;
    const path = join(dir, `${archiveId}-${partNumber}`);
    await writeFile(path, Buffer.concat(chunks));
    a.parts.set(partNumber, { sizeBytes: received, path });
    record.status = 200;
    record.bytes = received;
    res.writeHead(200, { etag: `"${createHash('md5').update(String(received)).digest('hex')}"` });
    res.end();
  }

  const server: Server = createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://fake');
    const handle = async () => {
      const storeMatch = /^\/store\/([^/]+)\/(\d+)$/.exec(url.pathname);
      if (req.method === 'PUT' && storeMatch) return store(req, res, storeMatch[1], Number(storeMatch[2]), Number(url.searchParams.get('generation') ?? 0));
      if (url.pathname.startsWith(API)) return api(req, res, url.pathname.slice(API.length), url.searchParams);
      return notFound(res, url.pathname);
    };
    handle().catch((e: unknown) => {
      if (!res.headersSent) send(res, 500, { error: { code: 'internal', message: String(e) } });
      else res.destroy();
    });
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const address = server.address();
  fake.url = `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}`;
  return fake;
}
