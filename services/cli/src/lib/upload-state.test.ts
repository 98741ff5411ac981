import { readFileSync, statSync, writeFileSync } from 'node:fs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { tempConfigDir } from '../../test/cli-harness';
import { loadUploadState, removeUploadState, saveUploadState, uploadKey, uploadStatePath, type UploadIdentity } from './upload-state';

let config: ReturnType<typeof tempConfigDir>;
let env: NodeJS.ProcessEnv;
beforeEach(() => {
  config = tempConfigDir();
  env = { LOCALIS_CONFIG_DIR: config.dir };
});
afterEach(() => config.remove());

const ARCHIVE = '5e2d9c1a-0b1d-4e6f-9a7b-2c5d8e1f4a6b';
const identity: UploadIdentity = {
  portal: 'http://127.0.0.1:4100',
  campaignId: '3F1C9A52-7D4E-4B8A-9C61-2E5F0A7B8D90',
  kind: 'results',
  path: '/scratch/me/results.tar.gz',
  sizeBytes: 42_000_000,
  mtimeMs: 1_790_000_000_123.75,
};

describe('resume bookkeeping', () => {
  it('should remember the archive of an upload and find it again for the same file', () => {
    expect(loadUploadState(identity, env)).toBeNull();
    const path = saveUploadState(identity, ARCHIVE, env, new Date('2026-12-01T10:00:00Z'));
    expect(path).toBe(uploadStatePath(identity, env));
    expect(path.startsWith(`${config.dir}/uploads/`)).toBe(true);
    expect(loadUploadState(identity, env)).toEqual({
      archiveId: ARCHIVE,
      portal: identity.portal,
      campaignId: identity.campaignId.toLowerCase(),
      kind: 'results',
      path: identity.path,
      sizeBytes: identity.sizeBytes,
      mtimeMs: 1_790_000_000_123,
      startedAt: '2026-12-01T10:00:00.000Z',
    });
  });

  it('should keep the file readable by its owner only, in a folder closed to others', () => {
    const path = saveUploadState(identity, ARCHIVE, env);
    expect(statSync(path).mode & 0o777).toBe(0o600);
    expect(statSync(config.dir).mode & 0o777).toBe(0o700);
  });

  it('should treat a changed file, another campaign, kind or portal as another upload', () => {
    saveUploadState(identity, ARCHIVE, env);
    const others: UploadIdentity[] = [
      { ...identity, sizeBytes: identity.sizeBytes + 1 },
      { ...identity, mtimeMs: identity.mtimeMs + 1000 },
      { ...identity, path: '/scratch/me/other.tar.gz' },
      { ...identity, campaignId: '00000000-0000-4000-8000-000000000001' },
      { ...identity, kind: 'pilot-timings' },
      { ...identity, portal: 'https://localis.example.org' },
    ];
    for (const other of others) {
      expect(uploadKey(other)).not.toBe(uploadKey(identity));
      expect(loadUploadState(other, env)).toBeNull();
    }
  });

  it('should give the same key whatever the case of the campaign id and below a millisecond of mtime', () => {
    expect(uploadKey({ ...identity, campaignId: identity.campaignId.toLowerCase(), mtimeMs: 1_790_000_000_123.1 })).toBe(uploadKey(identity));
  });

  it('should ignore a state file that is not valid or is about another file', () => {
    const path = saveUploadState(identity, ARCHIVE, env);
    writeFileSync(path, '{ not json');
    expect(loadUploadState(identity, env)).toBeNull();
    saveUploadState(identity, ARCHIVE, env);
    writeFileSync(path, JSON.stringify({ ...JSON.parse(readFileSync(path, 'utf8')), archiveId: 'not-a-uuid' }));
    expect(loadUploadState(identity, env)).toBeNull();
    saveUploadState(identity, ARCHIVE, env);
    const state = JSON.parse(readFileSync(path, 'utf8'));
    writeFileSync(path, JSON.stringify({ ...state, path: '/elsewhere.tar.gz' }));
    expect(loadUploadState(identity, env)).toBeNull();
  });

  it('should forget the upload once removed, and not mind removing twice', () => {
    saveUploadState(identity, ARCHIVE, env);
    removeUploadState(identity, env);
    expect(loadUploadState(identity, env)).toBeNull();
    expect(() => removeUploadState(identity, env)).not.toThrow();
  });
});
