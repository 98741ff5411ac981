import { createHash } from 'node:crypto';
import type { Archive, ArchiveKind } from '@localis/shared';
import { vi } from 'vitest';
import { jsonResponse as json, notServed } from '../../../test/fetch-stub';

export const CAMPAIGN_ID = '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d';
const STORE = 'https://store.test/bucket';

/** An archive as the api answers, for tests. */
export function archiveFixture(overrides: Partial<Archive> = {}): Archive {
  return {
    id: '7c1d2e3f-4a5b-4c6d-8e7f-9a0b1c2d3e4f',
    campaignId: CAMPAIGN_ID,
    kind: 'results',
    fileName: 'wc-sweep-L8-16.tar.gz',
    format: 'tar.gz',
    sizeBytes: 3 * 1024 ** 3,
    partSizeBytes: 8 * 1024 ** 2,
    partCount: 384,
    declaredSha256: '5e'.repeat(32),
    state: 'verified',
    problems: [],
    runIds: [],
    manifest: null,
    uploadedByName: 'Ilse Marrow',
    createdAt: '2027-03-01T09:00:00.000Z',
    receivedAt: '2027-03-01T09:20:00.000Z',
    checkedAt: '2027-03-01T09:21:00.000Z',
    withdrawnAt: null,
    withdrawnReason: null,
    withdrawnByName: null,
    provenanceEntryId: null,
    ...overrides,
  };
}

interface PutCall {
  partNumber: number;
  url: string;
  signal?: AbortSignal | null;
}

/**
 * The api's archive routes and the object store, in process: uploads are made, part addresses
 * handed out and parts stored byte for byte, so a test can check what arrived and its SHA-256.
 * `holdPuts` keeps PUTs waiting until `releasePuts()`, to see how many run at once and to pause them.
 */
export class ArchiveStoreFake {
  partSizeBytes = 1000;
  archives = new Map<string, Archive>();
  stored = new Map<string, Map<number, Uint8Array>>();
  puts: PutCall[] = [];
  partUrlRequests: number[][] = [];
  completed: { id: string; sha256: string }[] = [];
  inFlight = 0;
  maxInFlight = 0;
  holdPuts = false;
  /** Answers a PUT with this status instead of storing it, while it returns one. */
  failPut: (partNumber: number, attempt: number, url: string) => number | 'network' | null = () => null;
  /** Other routes of the api a page needs (the campaign, the provenance log); null when not served. */
  extra: (url: string, init?: RequestInit) => Response | null = () => null;
  private held: (() => void)[] = [];
  private urlVersion = 0;
  private nextId = 1;

  readonly fetch = vi.fn((input: string, init?: RequestInit) => this.serve(String(input), init));

  /** Lets every held PUT go on, and later ones through. */
  releasePuts(): void {
    this.holdPuts = false;
    for (const go of this.held.splice(0)) go();
  }

  /** Archives the api knows already. */
  add(...archives: Archive[]): void {
    for (const a of archives) {
      this.archives.set(a.id, a);
      this.stored.set(a.id, new Map());
    }
  }

  /** An unfinished upload of `bytes` whose `storedParts` the store holds already. */
  unfinished(bytes: Uint8Array, storedParts: Record<number, Uint8Array>, kind: ArchiveKind = 'results', fileName = 'wc-sweep.tar.gz'): Archive {
    const partCount = Math.ceil(bytes.length / this.partSizeBytes);
    const archive = archiveFixture({ id: this.newId(), kind, fileName, sizeBytes: bytes.length, partSizeBytes: this.partSizeBytes, partCount, state: 'uploading', receivedAt: null, checkedAt: null });
    this.archives.set(archive.id, archive);
    this.stored.set(archive.id, new Map(Object.entries(storedParts).map(([n, b]) => [Number(n), b])));
    return archive;
  }

  /** What the store holds of an archive, joined in part order. */
  joined(id: string): Uint8Array {
    const parts = [...(this.stored.get(id) ?? new Map<number, Uint8Array>()).entries()].sort(([a], [b]) => a - b).map(([, b]) => b);
    return new Uint8Array(Buffer.concat(parts));
  }

  putsOf(partNumber: number): PutCall[] {
    return this.puts.filter((p) => p.partNumber === partNumber);
  }

  private newId(): string {
    return `7c1d2e3f-4a5b-4c6d-8e7f-${String(this.nextId++).padStart(12, '0')}`;
  }

  private async serve(url: string, init?: RequestInit): Promise<Response> {
    const method = init?.method ?? 'GET';
    if (url.startsWith(STORE) && method === 'PUT') return this.put(url, init);
    const other = this.extra(url, init);
    if (other) return other;
    const body = init?.body ? (JSON.parse(String(init.body)) as Record<string, unknown>) : {};
    const create = url.match(/^\/api\/v1\/campaigns\/([^/]+)\/archives$/);
    if (create && method === 'GET') {
      const items = [...this.archives.values()].filter((a) => a.campaignId === create[1]);
      return json(200, { items });
    }
    if (create && method === 'POST') {
      const sizeBytes = body.sizeBytes as number;
      const partCount = Math.max(1, Math.ceil(sizeBytes / this.partSizeBytes));
      const archive = archiveFixture({
        id: this.newId(),
        campaignId: create[1],
        kind: body.kind as ArchiveKind,
        fileName: body.fileName as string,
        sizeBytes,
        partSizeBytes: this.partSizeBytes,
        partCount,
        state: 'uploading',
        runIds: (body.runIds as string[] | undefined) ?? [],
        receivedAt: null,
        checkedAt: null,
      });
      this.archives.set(archive.id, archive);
      this.stored.set(archive.id, new Map());
      return json(201, { archive, partSizeBytes: this.partSizeBytes, partCount });
    }
    const one = url.match(/^\/api\/v1\/archives\/([^/]+)(\/[a-z-]+)?$/);
    const archive = one ? this.archives.get(one[1]) : undefined;
    if (!one || !archive) return notServed(url);
    const action = one[2] ?? '';
    if (action === '' && method === 'GET') return json(200, archive);
    if (action === '/parts' && method === 'GET') {
      const parts = [...this.stored.get(archive.id)!.entries()].map(([partNumber, b]) => ({ partNumber, sizeBytes: b.length }));
      return json(200, { parts });
    }
    if (action === '/part-urls' && method === 'POST') {
      const partNumbers = body.partNumbers as number[];
      this.partUrlRequests.push(partNumbers);
      const version = ++this.urlVersion;
      const expiresAt = new Date(Date.now() + 15 * 60_000).toISOString();
      return json(200, { urls: partNumbers.map((n) => ({ partNumber: n, url: `${STORE}/${archive.id}/${n}?v=${version}`, expiresAt })) });
    }
    if (action === '/complete' && method === 'POST') {
      const sha256 = body.sha256 as string;
      this.completed.push({ id: archive.id, sha256 });
      const actual = createHash('sha256').update(this.joined(archive.id)).digest('hex');
      if (actual !== sha256) return json(409, { error: { code: 'conflict', message: 'the parts do not add up to that SHA-256' } });
      const received = { ...archive, state: 'received' as const, declaredSha256: sha256, receivedAt: '2027-03-01T10:00:00.000Z' };
      this.archives.set(archive.id, received);
      return json(200, received);
    }
    if (action === '/download' && method === 'GET') {
      return json(200, { url: `${STORE}/${archive.id}/file?signature=abc`, expiresAt: new Date(Date.now() + 300_000).toISOString() });
    }
    if (action === '/withdraw' && method === 'POST') {
      const reason = String(body.reason ?? '').trim();
      if (reason.length < 10) {
        return json(422, { error: { code: 'invalid', message: 'The request has errors.', details: [{ path: ['reason'], message: 'say in at least 10 characters why the archive is withdrawn' }] } });
      }
      const withdrawn = { ...archive, withdrawnAt: '2027-03-02T08:00:00.000Z', withdrawnReason: reason, withdrawnByName: 'Orla Fenn' };
      this.archives.set(archive.id, withdrawn);
      return json(200, withdrawn);
    }
    return notServed(url);
  }

  private async put(url: string, init?: RequestInit): Promise<Response> {
    const match = url.slice(STORE.length).match(/^\/([^/]+)\/(\d+)\?v=(\d+)$/);
    if (!match) return new Response('no such key', { status: 404 });
    const [, id, part] = match;
    const partNumber = Number(part);
    const signal = init?.signal;
    this.puts.push({ partNumber, url, signal });
    const attempt = this.putsOf(partNumber).length;
    this.inFlight += 1;
    this.maxInFlight = Math.max(this.maxInFlight, this.inFlight);
    try {
      await new Promise<void>((resolve, reject) => {
        const aborted = () => reject(new DOMException('The operation was aborted.', 'AbortError'));
        if (signal?.aborted) return aborted();
        signal?.addEventListener('abort', aborted, { once: true });
        // A turn of the event loop even when not held, so parallel PUTs overlap as on a network.
        if (this.holdPuts) this.held.push(resolve);
        else setTimeout(resolve, 1);
      });
      const failure = this.failPut(partNumber, attempt, url);
      if (failure === 'network') throw new TypeError('Failed to fetch');
      if (failure !== null) return new Response('<Error/>', { status: failure });
      const bytes = new Uint8Array(await (init?.body as Blob).arrayBuffer());
      this.stored.get(id)!.set(partNumber, bytes);
      return new Response(null, { status: 200, headers: { etag: `"${partNumber}"` } });
    } finally {
      this.inFlight -= 1;
    }
  }
}

/** Bytes that differ from part to part, so a part sent twice or out of place shows. */
export function testBytes(length: number): Uint8Array<ArrayBuffer> {
  const bytes = new Uint8Array(length);
  for (let i = 0; i < length; i++) bytes[i] = (i * 31 + (i >> 8) * 7) & 0xff;
  return bytes;
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}
