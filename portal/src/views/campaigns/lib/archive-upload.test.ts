import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ArchiveStoreFake, CAMPAIGN_ID, sha256Hex, testBytes } from '../test/archive-store-fake';
import { ArchiveUploader, CONNECTION_LOST, UploadError, type ArchiveUploadOptions, type UploadProgress } from './archive-upload';
import { findRememberedUpload, rememberedUploads, rememberUpload } from './archive-upload-memory';

/** In-memory Storage, so each test starts with nothing remembered. */
function memoryStorage(): Storage {
  const items = new Map<string, string>();
  return {
    get length() {
      return items.size;
    },
    clear: () => items.clear(),
    getItem: (k) => items.get(k) ?? null,
    key: (i) => [...items.keys()][i] ?? null,
    removeItem: (k) => void items.delete(k),
    setItem: (k, v) => void items.set(k, String(v)),
  };
}

let store: ArchiveStoreFake;
let storage: Storage;
let events: UploadProgress[];

function fileOf(bytes: Uint8Array<ArrayBuffer>, name = 'wc-sweep.tar.gz', lastModified = 1_700_000_000_000): File {
  return new File([bytes], name, { lastModified });
}

function uploader(file: File, options: Partial<ArchiveUploadOptions> = {}): ArchiveUploader {
  return new ArchiveUploader({
    file,
    campaignId: CAMPAIGN_ID,
    kind: 'results',
    storage,
    connection: new EventTarget(),
    backoffMs: () => 0,
    onProgress: (p) => events.push(p),
    ...options,
  });
}

describe('ArchiveUploader', () => {
  beforeEach(() => {
    store = new ArchiveStoreFake();
    storage = memoryStorage();
    events = [];
    vi.stubGlobal('fetch', store.fetch);
  });

  afterEach(() => {
    vi.unstubAllGlobals();
  });

  describe('a new upload', () => {
    it('should send every part, at most 4 at a time, and complete with the SHA-256 of the whole file', async () => {
      const bytes = testBytes(10_500);
      const archive = await uploader(fileOf(bytes), { runIds: ['5f0c1a2b-3c4d-4e5f-8a9b-0c1d2e3f4a5b'] }).start();

      expect(archive.state).toBe('received');
      const created = store.fetch.mock.calls.find(([url, init]) => url.endsWith('/archives') && init?.method === 'POST');
      expect(JSON.parse(String(created?.[1]?.body))).toEqual({ kind: 'results', fileName: 'wc-sweep.tar.gz', sizeBytes: 10_500, runIds: ['5f0c1a2b-3c4d-4e5f-8a9b-0c1d2e3f4a5b'] });
      expect(store.puts.map((p) => p.partNumber).sort((a, b) => a - b)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
      expect(store.maxInFlight).toBe(4);
      // Every address in one batch: the parallel senders wait for the request already out.
      expect(store.partUrlRequests).toEqual([[1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]]);
      expect(store.joined(archive.id)).toEqual(bytes);
      expect(store.completed).toEqual([{ id: archive.id, sha256: sha256Hex(bytes) }]);
    });

    it('should send the parts as they are, with no cookies', async () => {
      await uploader(fileOf(testBytes(1500))).start();
      const put = store.fetch.mock.calls.find(([, init]) => init?.method === 'PUT');
      expect(put?.[1]).toMatchObject({ method: 'PUT', credentials: 'omit' });
      expect(put?.[1]?.headers).toBeUndefined();
    });

    it('should compute the same SHA-256 as node when the file is read in many small slices', async () => {
      // NIST's "abc" example (FIPS 180-4, example B.1) and a file cut at odd places.
      await uploader(fileOf(new TextEncoder().encode('abc'))).start();
      expect(store.completed[0].sha256).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');

      const bytes = testBytes(7777);
      await uploader(fileOf(bytes), { hashChunkBytes: 333 }).start();
      expect(store.completed[1].sha256).toBe(sha256Hex(bytes));
    });

    it('should report progress up to done, with the bytes sent and hashed', async () => {
      const bytes = testBytes(4200);
      await uploader(fileOf(bytes)).start();
      const states = [...new Set(events.map((e) => e.state))];
      expect(states).toEqual(['preparing', 'uploading', 'completing', 'done']);
      const last = events[events.length - 1];
      expect(last).toMatchObject({ sentBytes: 4200, totalBytes: 4200, hashedBytes: 4200, state: 'done' });
      const sent = events.map((e) => e.sentBytes);
      expect(sent).toEqual([...sent].sort((a, b) => a - b));
    });

    it('should remember the upload while it runs and forget it once complete', async () => {
      store.holdPuts = true;
      const file = fileOf(testBytes(2500));
      const upload = uploader(file);
      const done = upload.start();
      await vi.waitFor(() => expect(store.inFlight).toBe(3));
      expect(findRememberedUpload(CAMPAIGN_ID, file, storage)?.archiveId).toBe(upload.archiveId);
      store.releasePuts();
      await done;
      expect(rememberedUploads(storage)).toEqual([]);
    });
  });

  describe('resuming', () => {
    it('should send only the parts the store lacks or holds cut short, and still hash every byte', async () => {
      const bytes = testBytes(10_500);
      const part = (n: number) => bytes.slice((n - 1) * 1000, n * 1000);
      const unfinished = store.unfinished(bytes, { 1: part(1), 2: part(2), 3: part(3), 5: part(5), 6: part(6).slice(0, 400) });
      rememberUpload({ archiveId: unfinished.id, campaignId: CAMPAIGN_ID, kind: 'results', fileName: 'wc-sweep.tar.gz', sizeBytes: 10_500, lastModified: 1, startedAt: '' }, storage);

      const archive = await uploader(fileOf(bytes), { resumeArchiveId: unfinished.id }).start();

      expect(store.fetch.mock.calls.some(([url, init]) => url.endsWith('/archives') && init?.method === 'POST')).toBe(false);
      expect(store.puts.map((p) => p.partNumber).sort((a, b) => a - b)).toEqual([4, 6, 7, 8, 9, 10, 11]);
      expect(store.partUrlRequests).toEqual([[4, 6, 7, 8, 9, 10, 11]]);
      expect(events.find((e) => e.state === 'uploading')?.sentBytes).toBe(4000);
      expect(events[events.length - 1].hashedBytes).toBe(10_500);
      expect(store.completed).toEqual([{ id: archive.id, sha256: sha256Hex(bytes) }]);
      expect(rememberedUploads(storage)).toEqual([]);
    });

    it('should refuse a file of another size than the unfinished upload', async () => {
      const unfinished = store.unfinished(testBytes(3000), {});
      await expect(uploader(fileOf(testBytes(2999)), { resumeArchiveId: unfinished.id }).start()).rejects.toThrow('it is not the same file');
      expect(events[events.length - 1]).toMatchObject({ state: 'failed' });
      expect(store.puts).toEqual([]);
    });

    it('should only complete when every part is stored already', async () => {
      const bytes = testBytes(2000);
      const unfinished = store.unfinished(bytes, { 1: bytes.slice(0, 1000), 2: bytes.slice(1000) });
      await uploader(fileOf(bytes), { resumeArchiveId: unfinished.id }).start();
      expect(store.puts).toEqual([]);
      expect(store.completed[0].sha256).toBe(sha256Hex(bytes));
    });
  });

  describe('pause and resume', () => {
    it('should cut off the parts in flight on pause, send nothing while paused, and send them again on resume', async () => {
      store.holdPuts = true;
      const bytes = testBytes(6000);
      const upload = uploader(fileOf(bytes));
      const done = upload.start();
      await vi.waitFor(() => expect(store.inFlight).toBe(4));

      upload.pause();
      expect(upload.progress.state).toBe('paused');
      expect(store.puts.every((p) => p.signal?.aborted)).toBe(true);
      await vi.waitFor(() => expect(store.inFlight).toBe(0));
      store.releasePuts();
      await new Promise((r) => setTimeout(r, 20));
      expect(store.puts).toHaveLength(4);

      upload.resume();
      expect(upload.progress.state).toBe('uploading');
      const archive = await done;
      expect(store.putsOf(1)).toHaveLength(2);
      expect(store.putsOf(6)).toHaveLength(1);
      expect(store.joined(archive.id)).toEqual(bytes);
      expect(store.completed[0].sha256).toBe(sha256Hex(bytes));
    });

    it('should stop and forget the upload on cancel', async () => {
      store.holdPuts = true;
      const upload = uploader(fileOf(testBytes(3000)));
      const done = upload.start();
      await vi.waitFor(() => expect(store.inFlight).toBe(3));
      upload.cancel();
      await expect(done).rejects.toThrow('cancelled');
      expect(upload.progress.state).toBe('failed');
      expect(rememberedUploads(storage)).toEqual([]);
      expect(store.completed).toEqual([]);
    });
  });

  describe('failures', () => {
    it('should ask for a new address when the store answers 403 and send the part there', async () => {
      store.failPut = (n, _attempt, url) => (n === 3 && url.endsWith('?v=1') ? 403 : null);
      const bytes = testBytes(5000);
      await uploader(fileOf(bytes)).start();
      expect(store.partUrlRequests).toHaveLength(2);
      expect(store.partUrlRequests[1][0]).toBe(3);
      expect(store.putsOf(3).map((p) => p.url.split('?')[1])).toEqual(['v=1', 'v=2']);
      expect(store.completed[0].sha256).toBe(sha256Hex(bytes));
    });

    it('should retry a refused part with growing waits and go on when it is taken', async () => {
      store.failPut = (n, attempt) => (n === 2 && attempt <= 2 ? 503 : null);
      const waits: number[] = [];
      await uploader(fileOf(testBytes(3000)), { backoffMs: (attempt) => (waits.push(attempt), 0) }).start();
      expect(waits).toEqual([1, 2]);
      expect(store.putsOf(2)).toHaveLength(3);
      expect(store.completed).toHaveLength(1);
    });

    it('should fail with the part and the status after 5 retries', async () => {
      store.failPut = (n) => (n === 2 ? 500 : null);
      const upload = uploader(fileOf(testBytes(3000)));
      const failure = await upload.start().catch((e: unknown) => e);
      expect(failure).toBeInstanceOf(UploadError);
      expect(store.putsOf(2)).toHaveLength(6);
      expect(upload.progress).toMatchObject({ state: 'failed', error: expect.stringContaining('part 2 of 3 (HTTP 500) 6 times') });
      expect(store.completed).toEqual([]);
      // Kept, so picking the file again goes on from the parts stored.
      expect(rememberedUploads(storage)).toHaveLength(1);
    });

    it('should pause on a dropped connection with words to act on, and go on when the browser is online again', async () => {
      store.failPut = (n, attempt) => (n === 2 && attempt === 1 ? 'network' : null);
      const connection = new EventTarget();
      const bytes = testBytes(3000);
      const upload = uploader(fileOf(bytes), { connection });
      const done = upload.start();
      await vi.waitFor(() => expect(upload.progress.state).toBe('paused'));
      expect(upload.progress.error).toBe(CONNECTION_LOST);

      connection.dispatchEvent(new Event('online'));
      const archive = await done;
      expect(store.joined(archive.id)).toEqual(bytes);
      expect(events[events.length - 1]).not.toHaveProperty('error');
    });

    it('should go on from a dropped connection when the person presses resume', async () => {
      store.failPut = (n, attempt) => (n === 1 && attempt === 1 ? 'network' : null);
      const upload = uploader(fileOf(testBytes(2000)));
      const done = upload.start();
      await vi.waitFor(() => expect(upload.progress.state).toBe('paused'));
      upload.resume();
      await expect(done).resolves.toMatchObject({ state: 'received' });
    });
  });
});
