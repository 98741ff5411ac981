import { createHash, randomBytes } from 'node:crypto';
import { EventEmitter } from 'node:events';
import { readdirSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { tempConfigDir } from '../../test/cli-harness';
import { failure } from '../../test/cli-error-of';
import { upload, type UploadIo } from './upload';
import { startFakePortal, type FakePortal } from './upload-fake-portal';
import type { UploadOptions } from './upload-options';
import { loadUploadState, saveUploadState } from './upload-state';

// The upload against a stand-in of the api and the store in this process (upload-fake-portal.ts):
// resuming, retries and fresh addresses, without the test stack. The real binary against the real
// stack is tested in commands/upload.command.test.ts.

const MiB = 1024 ** 2;
const CAMPAIGN = '3f1c9a52-7d4e-4b8a-9c61-2e5f0a7b8d90';

let config: ReturnType<typeof tempConfigDir>;
let portal: FakePortal;
let outs: string[];
let notes: string[];
let errs: string[];
let signals: EventEmitter;
beforeEach(async () => {
  config = tempConfigDir();
  portal = await startFakePortal({ checkDelayMs: 10 });
  outs = [];
  notes = [];
  errs = [];
  signals = new EventEmitter();
});
afterEach(async () => {
  await portal.close();
  config.remove();
});

const env = () => ({ LOCALIS_CONFIG_DIR: config.dir, LOCALIS_URL: portal.url, LOCALIS_TOKEN: portal.token });
const io = (): UploadIo => ({
  out: { out: (t) => void outs.push(t), note: (t) => void notes.push(t) },
  stderr: { isTTY: false, write: (t: string) => (errs.push(t), true) } as unknown as NodeJS.WriteStream,
  env: env(),
  signals,
  retryBackoffMs: () => 5,
});
const opts = (more: Partial<UploadOptions> = {}): UploadOptions => ({ campaign: CAMPAIGN, kind: 'results', json: false, stats: false, wait: true, parallel: '4', profile: 'default', ...more });

/** A file of random bytes: `size` bytes, 20 MiB and a bit by default (three parts: 8, 8 and 4 MiB). */
function archiveFile(name = 'results.tar', size = 20 * MiB + 7): { path: string; sha256: string; size: number } {
  const bytes = randomBytes(size);
  const path = join(config.dir, name);
  writeFileSync(path, bytes);
  return { path, sha256: createHash('sha256').update(bytes).digest('hex'), size };
}
const identityOf = (path: string) => ({ portal: portal.url, campaignId: CAMPAIGN, kind: 'results', path, sizeBytes: statSync(path).size, mtimeMs: statSync(path).mtimeMs });
const stored = (status = 200) => portal.puts.filter((p) => p.status === status).map((p) => p.partNumber).sort((a, b) => a - b);

describe('localis upload (in process, against a stand-in portal)', () => {
  it('should send every part once, complete with the SHA-256 of the file, wait for the check and forget the upload', async () => {
    const file = archiveFile();
    await upload(file.path, opts({ run: ['A1B2C3D4-0001-4E5F-8A9B-0C1D2E3F4A5B'] }), io());
    const [archive] = [...portal.archives.values()].map((a) => a.dto);
    expect(archive).toMatchObject({ state: 'verified', declaredSha256: file.sha256, sizeBytes: file.size, partCount: 3, runIds: ['a1b2c3d4-0001-4e5f-8a9b-0c1d2e3f4a5b'] });
    expect(stored()).toEqual([1, 2, 3]);
    expect(outs[0]).toMatch(/^Verified: results\.tar \(20\.0 MiB\) is in the campaign's archives\n/);
    expect(outs[0]).toContain(`  SHA-256   ${file.sha256}\n`);
    expect(outs[0]).toMatch(/ {2}sent {6}3 of 3 parts \(20\.0 MiB\) in \d+\.\d s/);
    expect(errs.join('')).toContain(`localis: uploading results.tar (20.0 MiB, 3 parts of 8.00 MiB) as archive ${archive.id}.\n`);
    expect(errs.join('')).toContain('localis: results.tar: verified.\n');
    expect(loadUploadState(identityOf(file.path), env())).toBeNull();
    expect(readdirSync(join(config.dir, 'uploads'))).toEqual([]);
  });

  it('should print the archive, what was sent and the stats as JSON with --json --stats', async () => {
    const file = archiveFile('results.tar.gz', 3 * MiB);
    await upload(file.path, opts({ json: true, stats: true }), io());
    const json = JSON.parse(outs[0]);
    expect(json).toMatchObject({
      archive: { state: 'verified', fileName: 'results.tar.gz', format: 'tar.gz' },
      sha256: file.sha256,
      upload: { partCount: 1, partsSent: 1, sentBytes: 3 * MiB, partsAlreadyStored: 0, alreadyStoredBytes: 0, resumed: false },
      stats: { sentBytes: 3 * MiB },
    });
    expect(json.stats.peakRssBytes).toBeGreaterThan(10 * MiB);
    expect(json.stats.seconds).toBeGreaterThan(0);
    expect(json.stats.megabytesPerSecond).toBeGreaterThan(0);
  });

  it('should keep the upload when a part keeps failing, and send only the missing parts when run again', async () => {
    const file = archiveFile('results.tar', 36 * MiB); // five parts
    portal.failPut(3, 100, 500);
    const e = await failure(upload(file.path, opts({ parallel: '1' }), io()));
    expect(e.exitCode).toBe(1);
    expect(e.message).toBe('part 3 of 5 could not be sent after 6 tries: the store answered 500 InternalError.');
    expect(e.hint).toBe('The parts sent so far are kept: run the same command again to send the rest.');
    expect(errs.join('')).toContain('localis: part 3: the store answered 500 InternalError; trying again in 0 s (retry 5).\n');
    const remembered = loadUploadState(identityOf(file.path), env());
    expect(remembered).not.toBeNull();
    expect(stored()).toEqual([1, 2]);

    portal.failPut(3, 0, 500);
    portal.puts.length = 0;
    errs = [];
    await upload(file.path, opts({ parallel: '1', json: true }), io());
    expect(stored()).toEqual([3, 4, 5]);
    const json = JSON.parse(outs[0]);
    expect(json.archive).toMatchObject({ id: remembered!.archiveId, state: 'verified', declaredSha256: file.sha256 });
    expect(json.upload).toMatchObject({ resumed: true, partsAlreadyStored: 2, alreadyStoredBytes: 16 * MiB, partsSent: 3, sentBytes: 20 * MiB });
    expect(errs.join('')).toContain(`localis: going on with archive ${remembered!.archiveId}: 2 of 5 parts (16.0 MiB) are stored already; sending the other 3.\n`);
    expect(portal.archives.size).toBe(1);
    expect(loadUploadState(identityOf(file.path), env())).toBeNull();
  });

  it('should try a refused part again after a wait, and ask a fresh address once for free on 403', async () => {
    const file = archiveFile();
    portal.failPut(2, 2, 503);
    portal.failPut(3, 1, 403);
    await upload(file.path, opts({ parallel: '1' }), io());
    expect(portal.puts.map((p) => `${p.partNumber}:${p.status}`)).toEqual(['1:200', '2:503', '2:503', '2:200', '3:403', '3:200']);
    expect(errs.join('')).toContain('localis: part 2: the store answered 503 InternalError; trying again in 0 s (retry 1).\n');
    expect(errs.join('')).not.toContain('part 3:');
    expect(portal.calls.filter((c) => c.endsWith('/part-urls'))).toHaveLength(2);
  });

  it('should ask fresh addresses when all expired', async () => {
    const file = archiveFile();
    portal.expireUrls();
    await upload(file.path, opts(), io());
    expect(stored()).toEqual([1, 2, 3]);
  });

  it('should exit 1 with a line per problem when the check rejects the archive', async () => {
    await portal.close();
    portal = await startFakePortal({
      checkDelayMs: 10,
      problems: [
        { code: 'file-missing', path: 'results/raw/b.bin', message: '"results/raw/b.bin" is listed in manifest.json but is not in the archive' },
        { code: 'table-invalid', message: 'the archive holds no result table' },
      ],
    });
    const file = archiveFile();
    const e = await failure(upload(file.path, opts(), io()));
    expect(e.exitCode).toBe(1);
    expect(e.message).toBe(
      "results.tar was rejected by the portal's check (2 problems):\n" +
        '  file-missing results/raw/b.bin: "results/raw/b.bin" is listed in manifest.json but is not in the archive\n' +
        '  table-invalid: the archive holds no result table',
    );
    expect(outs).toEqual([]);
  });

  it('should stop once complete with --no-wait', async () => {
    const file = archiveFile();
    await upload(file.path, opts({ wait: false }), io());
    expect(outs[0]).toMatch(/^Uploaded: results\.tar \(20\.0 MiB\); the portal checks it now\n/);
    expect(errs.join('')).not.toContain('waiting for its check');
  });

  it('should stop on Ctrl-C with exit code 130, keep the parts sent and say how to go on', async () => {
    const file = archiveFile('results.tar', 36 * MiB);
    portal.slowPutsMs = 150;
    const running = upload(file.path, opts({ parallel: '1' }), io());
    while (stored().length < 2) await new Promise((r) => setTimeout(r, 10));
    signals.emit('SIGINT');
    const e = await failure(running);
    const remembered = loadUploadState(identityOf(file.path), env());
    expect(e).toMatchObject({ exitCode: 130, message: `interrupted; the parts sent so far are kept (archive ${remembered!.archiveId}).`, hint: 'Run the same command again to send the rest.' });
    const before = stored().length;
    expect(before).toBeLessThan(5);

    portal.slowPutsMs = 0;
    await upload(file.path, opts(), io());
    expect(portal.archives.get(remembered!.archiveId)!.dto.state).toBe('verified');
    expect(stored()).toHaveLength(5);
  });

  it('should start anew when the portal does not know the remembered archive', async () => {
    const file = archiveFile();
    saveUploadState(identityOf(file.path), '00000000-0000-4000-8000-000000000009', env());
    await upload(file.path, opts(), io());
    expect(errs.join('')).toContain('localis: the unfinished upload of results.tar (archive 00000000-0000-4000-8000-000000000009) is not known to the portal any more; starting anew.\n');
    expect([...portal.archives.values()][0].dto.state).toBe('verified');
  });

  it('should start anew when the remembered upload was cancelled or abandoned on the portal', async () => {
    const file = archiveFile();
    portal.failPut(2, 100, 500);
    await failure(upload(file.path, opts({ parallel: '1' }), io()));
    const remembered = loadUploadState(identityOf(file.path), env())!;
    const abandoned = portal.archives.get(remembered.archiveId)!;
    abandoned.dto = { ...abandoned.dto, state: 'rejected', problems: [{ code: 'upload-abandoned', message: 'the upload was not completed within 7 days; its parts were dropped' }] };
    portal.failPut(2, 0, 500);
    errs = [];
    await upload(file.path, opts(), io());
    expect(errs.join('')).toContain(
      `localis: the unfinished upload of results.tar (archive ${remembered.archiveId}) ended on the portal (the upload was not completed within 7 days; its parts were dropped); starting anew.\n`,
    );
    expect(portal.archives.size).toBe(2);
    expect(outs[0]).toMatch(/^Verified: results\.tar/);
  });

  it('should send nothing for a file uploaded completely already, and report its outcome', async () => {
    const file = archiveFile();
    await upload(file.path, opts({ wait: false }), io());
    const [archive] = [...portal.archives.values()].map((a) => a.dto);
    // As if the first run was stopped right after completing, before it forgot the upload.
    saveUploadState(identityOf(file.path), archive.id, env());
    portal.puts.length = 0;
    outs = [];
    await upload(file.path, opts(), io());
    expect(portal.puts).toEqual([]);
    expect(errs.join('')).toContain(`localis: results.tar was uploaded completely already (archive ${archive.id}`);
    expect(outs[0]).toMatch(/^Verified: results\.tar/);
  });

  it('should check the options and the file before anything is sent, exit code 2', async () => {
    const file = archiveFile();
    const cases: [Partial<UploadOptions>, string, string][] = [
      [{ campaign: 'nope' }, file.path, '--campaign "nope" is not a campaign id'],
      [{ run: ['r1'] }, file.path, '--run takes run ids (UUIDs'],
      [{ parallel: '0' }, file.path, '--parallel takes a whole number of parts from 1 to 16 (read "0")'],
      [{ limitRate: 'fast' }, file.path, '--limit-rate takes megabytes per second'],
      [{ kind: 'photos' }, file.path, '--kind "photos" is not a kind of upload'],
      [{ kind: 'pilot-timings', run: ['a1b2c3d4-0001-4e5f-8a9b-0c1d2e3f4a5b'] }, file.path, 'only result archives name runs'],
      [{}, join(config.dir, 'results.rar'), 'results.rar cannot be uploaded as a result archive: its name must end in .tar.gz, .tar, .zip (or .tgz).'],
      [{}, config.dir, 'cannot be uploaded'],
    ];
    writeFileSync(join(config.dir, 'empty.tar'), '');
    cases.push([{}, join(config.dir, 'empty.tar'), 'is empty; there is nothing to upload']);
    for (const [more, path, message] of cases) {
      const e = await failure(upload(path, opts(more), io()));
      expect(e.exitCode, message).toBe(2);
      expect(e.message).toContain(message);
    }
    expect((await failure(upload(join(config.dir, 'missing.tar'), opts(), io()))).message).toContain('no such file');
    expect(portal.calls).toEqual([]);
  });

  it('should exit 3 when not signed in', async () => {
    const file = archiveFile();
    const e = await failure(upload(file.path, opts(), { ...io(), env: { LOCALIS_CONFIG_DIR: config.dir, LOCALIS_URL: portal.url } }));
    expect(e.exitCode).toBe(3);
  });
});
