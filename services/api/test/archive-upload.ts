import { createHash } from 'node:crypto';
import { partRange, type Archive, type ArchiveUpload, type PartUrls } from '@localis/shared';

/** A signed-in caller of the api: a token's fetch, answering the raw Response. */
export type ApiCall = (method: string, path: string, body?: unknown) => Promise<Response>;

export const sha256Of = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

async function json<T>(res: Response, expected: number): Promise<T> {
  const text = await res.text();
  if (res.status !== expected) throw new Error(`expected ${expected}, got ${res.status}: ${text}`);
  return JSON.parse(text) as T;
}

/** Start an upload of `bytes`. */
export async function startUpload(call: ApiCall, campaignId: string, fileName: string, bytes: Uint8Array, opts: { kind?: string; runIds?: string[] } = {}): Promise<ArchiveUpload> {
  return json<ArchiveUpload>(await call('POST', `/campaigns/${campaignId}/archives`, { kind: opts.kind ?? 'results', fileName, sizeBytes: bytes.byteLength, runIds: opts.runIds ?? [] }), 201);
}

/** PUT the given parts of `bytes` straight to the object store through presigned URLs. */
export async function sendParts(call: ApiCall, upload: ArchiveUpload, bytes: Uint8Array, partNumbers: number[]): Promise<void> {
  if (!partNumbers.length) return;
  const { urls } = await json<PartUrls>(await call('POST', `/archives/${upload.archive.id}/part-urls`, { partNumbers }), 200);
  for (const { partNumber, url } of urls) {
    const { start, end } = partRange(partNumber, upload.partSizeBytes, bytes.byteLength);
    const res = await fetch(url, { method: 'PUT', body: Buffer.from(bytes.subarray(start, end)) as unknown as BodyInit });
    if (!res.ok) throw new Error(`part ${partNumber}: the store answered ${res.status} ${await res.text()}`);
  }
}

export async function complete(call: ApiCall, archiveId: string, sha256: string): Promise<Response> {
  return call('POST', `/archives/${archiveId}/complete`, { sha256 });
}

/** The whole path: start, every part, complete; the archive as received. */
export async function uploadArchive(call: ApiCall, campaignId: string, fileName: string, bytes: Uint8Array, opts: { kind?: string; runIds?: string[]; sha256?: string } = {}): Promise<Archive> {
  const upload = await startUpload(call, campaignId, fileName, bytes, opts);
  await sendParts(call, upload, bytes, Array.from({ length: upload.partCount }, (_, i) => i + 1));
  return json<Archive>(await complete(call, upload.archive.id, opts.sha256 ?? sha256Of(bytes)), 200);
}

/** Calls the api at `baseUrl` with a bearer token, as the CLI does. */
export const bearerCaller = (baseUrl: string, token: string): ApiCall => (method, path, body) =>
  fetch(`${baseUrl}/api/v1${path}`, {
    method,
    headers: { authorization: `Bearer ${token}`, ...(body !== undefined ? { 'content-type': 'application/json' } : {}) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });

/** Wait until a row leaves its moving states: this process or the test stack's worker runs the job (up to `seconds`). */
export async function settled<T extends { state: string }>(find: () => Promise<T | null>, moving: string[], seconds = 120): Promise<T> {
  let row = (await find())!;
  for (let i = 0; i < seconds * 10 && moving.includes(row.state); i++) {
    await new Promise((r) => setTimeout(r, 100));
    row = (await find())!;
  }
  return row;
}
