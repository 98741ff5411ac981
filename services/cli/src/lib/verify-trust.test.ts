import { generateKeyPairSync } from 'node:crypto';
import { readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { signingKeyDescription, signTreeHead } from '@localis/shared/node';
import { tempConfigDir } from '../../test/cli-harness';
import { failure } from '../../test/cli-error-of';
import { defaultHeadPath, keyFilePath, pinKey, readSavedHead, saveHead } from './verify-trust';

let config: ReturnType<typeof tempConfigDir>;
let env: NodeJS.ProcessEnv;
beforeEach(() => {
  config = tempConfigDir();
  env = { LOCALIS_CONFIG_DIR: config.dir };
});
afterEach(() => config.remove());

const PORTAL = 'http://127.0.0.1:4100';
const OTHER_PORTAL = 'https://localis.example.org';
const keyA = generateKeyPairSync('ed25519').privateKey;
const keyB = generateKeyPairSync('ed25519').privateKey;
const head = (n: number) => signTreeHead(keyA, { treeSize: n, rootHash: String(n % 10).repeat(64), timestamp: '2026-12-01T10:00:00Z' });

describe('the pinned signing key', () => {
  it('should pin the first key seen, in a file closed to others, and accept it again', () => {
    const first = pinKey(PORTAL, signingKeyDescription(keyA), env, new Date('2026-12-01T10:00:00Z'));
    expect(first.status).toBe('new');
    expect(first.pinned).toMatchObject({ keyId: signingKeyDescription(keyA).keyId, pinnedAt: '2026-12-01T10:00:00.000Z' });
    expect(statSync(keyFilePath(env)).mode & 0o777).toBe(0o600);
    expect(pinKey(PORTAL, signingKeyDescription(keyA), env).status).toBe('same');
  });

  it('should report a changed key and keep the pinned one', () => {
    pinKey(PORTAL, signingKeyDescription(keyA), env);
    const outcome = pinKey(PORTAL, signingKeyDescription(keyB), env);
    expect(outcome.status).toBe('changed');
    expect(outcome.pinned.publicKeyPem).toBe(signingKeyDescription(keyA).publicKeyPem);
    // Asking again does not make the new key trusted.
    expect(pinKey(PORTAL, signingKeyDescription(keyB), env).status).toBe('changed');
  });

  it('should pin one key per portal', () => {
    pinKey(PORTAL, signingKeyDescription(keyA), env);
    expect(pinKey(OTHER_PORTAL, signingKeyDescription(keyB), env).status).toBe('new');
    expect(pinKey(PORTAL, signingKeyDescription(keyA), env).status).toBe('same');
    expect(Object.keys(JSON.parse(readFileSync(keyFilePath(env), 'utf8')).keys)).toEqual([PORTAL, OTHER_PORTAL]);
  });

  it('should refuse a key file that is not one, rather than pin anew', async () => {
    writeFileSync(join(config.dir, 'provenance-key.json'), '{"keys": 3}');
    const e = await failure(Promise.resolve().then(() => pinKey(PORTAL, signingKeyDescription(keyA), env)));
    expect(e.message).toContain('is not a file of pinned provenance keys');
  });
});

describe('the saved tree head', () => {
  it('should keep one head per portal in the default file', () => {
    const path = defaultHeadPath(env);
    expect(readSavedHead(path, PORTAL)).toBeNull();
    saveHead(path, PORTAL, head(5), true);
    saveHead(path, OTHER_PORTAL, head(9), true);
    expect(readSavedHead(path, PORTAL)).toEqual(head(5));
    expect(readSavedHead(path, OTHER_PORTAL)).toEqual(head(9));
    saveHead(path, PORTAL, head(7), true);
    expect(readSavedHead(path, PORTAL)?.treeSize).toBe(7);
    expect(readSavedHead(path, OTHER_PORTAL)?.treeSize).toBe(9);
  });

  it('should read and write a --head file as one head, as GET /provenance/head answers it', () => {
    const path = join(config.dir, 'shared-head.json');
    writeFileSync(path, JSON.stringify(head(3)));
    expect(readSavedHead(path, PORTAL)).toEqual(head(3));
    saveHead(path, PORTAL, head(4), false);
    expect(JSON.parse(readFileSync(path, 'utf8'))).toEqual(head(4));
  });

  it('should refuse a file that holds no head', async () => {
    const path = join(config.dir, 'nonsense.json');
    writeFileSync(path, '{"treeSize": "many"}');
    expect((await failure(Promise.resolve().then(() => readSavedHead(path, PORTAL)))).message).toContain('is not a signed tree head');
  });
});
