import { EventEmitter } from 'node:events';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { goodArchive } from '@localis/shared/node';
import { tempConfigDir } from '../../test/cli-harness';
import { failure } from '../../test/cli-error-of';
import { upload } from './upload';
import { startFakePortal, type FakePortal } from './upload-fake-portal';
import { verify, type VerifyIo, type VerifyOptions } from './verify';
import { defaultHeadPath, keyFilePath } from './verify-trust';

// `localis verify` in process: the offline checks on archives written by the shared fixtures, and
// the provenance checks against the stand-in portal (upload-fake-portal.ts), whose log is a real
// RFC 6962 tree with signed heads.

let config: ReturnType<typeof tempConfigDir>;
let portal: FakePortal;
let outs: string[];
beforeEach(async () => {
  config = tempConfigDir();
  portal = await startFakePortal({ checkDelayMs: 5 });
  outs = [];
});
afterEach(async () => {
  await portal.close();
  config.remove();
});

const signedIn = () => ({ LOCALIS_CONFIG_DIR: config.dir, LOCALIS_URL: portal.url, LOCALIS_TOKEN: portal.token });
const offline = () => ({ LOCALIS_CONFIG_DIR: config.dir });
const io = (env: NodeJS.ProcessEnv): VerifyIo => ({
  out: { out: (t) => void outs.push(t), note: () => undefined },
  stderr: { isTTY: false, write: () => true } as unknown as NodeJS.WriteStream,
  env,
  signals: new EventEmitter(),
});
const opts = (more: Partial<VerifyOptions> = {}): VerifyOptions => ({ log: false, offline: false, requireLog: false, json: false, profile: 'default', ...more });

async function writeArchive(name = 'results.tar.gz', options: Parameters<typeof goodArchive>[0] = {}): Promise<{ path: string; sha256: string }> {
  const good = await goodArchive(options);
  const path = join(config.dir, name);
  writeFileSync(path, good.archive);
  return { path, sha256: good.sha256 };
}

async function uploadIt(path: string): Promise<void> {
  const quiet = { out: { out: () => undefined, note: () => undefined }, stderr: { isTTY: false, write: () => true } as unknown as NodeJS.WriteStream, env: signedIn(), signals: new EventEmitter() };
  await upload(path, { campaign: '3f1c9a52-7d4e-4b8a-9c61-2e5f0a7b8d90', kind: 'results', json: false, stats: false, wait: true, parallel: '4', profile: 'default' }, quiet);
}

describe('localis verify <archive>, offline', () => {
  it('should say what it checked and find no problem in a good archive', async () => {
    const a = await writeArchive();
    await verify(a.path, opts(), io(offline()));
    const lines = outs[0].split('\n');
    expect(lines[0]).toBe(`results.tar.gz: tar.gz, ${lines[0].split(', ')[1]}, SHA-256 ${a.sha256}`);
    expect(lines[1]).toBe("Checked on this machine, with the checks of the portal's worker:");
    expect(lines[2]).toMatch(/^ {2}ok {4}archive: read to the end, 2 entries/);
    expect(lines[3]).toMatch(/^ {2}ok {4}manifest\.json: campaign 3f1c9a52-7d4e-4b8a-9c61-2e5f0a7b8d90, 2 runs, tmm-anderson 2\.3\.1 \(9f3e2a1c\) on cluster-a$/);
    expect(lines[4]).toBe('  ok    files: all 1 listed in manifest.json are there with their sizes and SHA-256, and no other');
    expect(lines[5]).toMatch(/^ {2}ok {4}result tables: results\/lambda\.csv \(lambda, \d+ rows\)$/);
    expect(lines[6]).toBe("  --    campaign's plan: not compared (give --campaign-spec spec.json)");
    expect(lines).toContain('Not checked: no portal is signed in (localis login, or LOCALIS_URL and LOCALIS_TOKEN), so the provenance log was not asked.');
    expect(lines.at(-1)).toBe('No problems found.');
  });

  it('should exit 1 with one line per problem, naming its code and path', async () => {
    const a = await writeArchive('bad.zip', {
      format: 'zip',
      editManifest: (m) => ({ ...m, files: [...m.files, { path: 'results/missing.csv', sizeBytes: 3, sha256: '0'.repeat(64) }] }),
    });
    const e = await failure(verify(a.path, opts({ offline: true }), io(signedIn())));
    expect(e.exitCode).toBe(1);
    expect(e.message).toBe('bad.zip has 1 problem:\n  file-missing results/missing.csv: "results/missing.csv" is listed in manifest.json but is not in the archive');
    expect(outs[0]).toContain('  FAIL  files: 1 problem (file-missing)');
    expect(outs[0]).toContain('Not checked: the provenance log was not asked (--offline).');
    expect(portal.calls).toEqual([]);
  });

  it('should refuse what is not an archive, and wrong combinations of options, exit code 2', async () => {
    const text = join(config.dir, 'notes.txt');
    writeFileSync(text, 'hello');
    expect((await failure(verify(text, opts(), io(offline())))).exitCode).toBe(2);
    expect((await failure(verify(undefined, opts(), io(offline())))).message).toBe('give the archive to verify, or --log to check the provenance log.');
    expect((await failure(verify('a.tar', opts({ log: true }), io(offline())))).message).toBe('give either an archive to verify or --log, not both.');
    expect((await failure(verify('a.tar', opts({ head: 'h.json' }), io(offline())))).message).toBe('--head goes with --log.');
    expect((await failure(verify(undefined, opts({ log: true, offline: true }), io(offline())))).exitCode).toBe(2);
    expect((await failure(verify(join(config.dir, 'missing.tar.gz'), opts(), io(offline())))).message).toBe(`cannot read ${join(config.dir, 'missing.tar.gz')}: no such file.`);
  });
});

describe('localis verify <archive> with the provenance log', () => {
  it('should find the uploaded archive in the log and check its entry, proof and signed head', async () => {
    const a = await writeArchive();
    await uploadIt(a.path);
    portal.appendRecord();
    await verify(a.path, opts(), io(signedIn()));
    const text = outs[0];
    expect(text).toContain(`Checked against the provenance log of ${portal.url}:`);
    expect(text).toMatch(/ {2}ok {4}key [0-9a-f]{16} \(Ed25519\) pinned now, on first use, in .*provenance-key\.json/);
    expect(text).toMatch(/ {2}ok {4}log entry 0 \(archive-verified, .*\) names this file's SHA-256/);
    expect(text).toMatch(/ {2}ok {4}the entry's content hashes to its leaf hash/);
    expect(text).toMatch(/ {2}ok {4}inclusion proof: leaf 0 is in the tree of 2 entries/);
    expect(text).toMatch(/ {2}ok {4}the head of 2 entries .* is signed by key [0-9a-f]{16}/);
    expect(text.trimEnd().split('\n').at(-1)).toBe('No problems: this file is the archive the portal verified and logged.');
    expect(JSON.parse(readFileSync(keyFilePath(signedIn()), 'utf8')).keys[portal.url].keyId).toMatch(/^[0-9a-f]{16}$/);
  });

  it('should only say so when the archive is not in the log, and fail with --require-log', async () => {
    const a = await writeArchive();
    await verify(a.path, opts(), io(signedIn()));
    expect(outs[0]).toContain('  --    no verified archive with this SHA-256 is in the log');
    expect(outs[0].trimEnd().split('\n').at(-1)).toBe('No problems found.');
    const e = await failure(verify(a.path, opts({ requireLog: true }), io(signedIn())));
    expect(e.message).toContain('The provenance log check failed:\n  in-log: no verified archive with this SHA-256 is in the log');
  });

  it('should report a changed signing key and check the heads with the pinned one', async () => {
    const a = await writeArchive();
    await uploadIt(a.path);
    await verify(a.path, opts(), io(signedIn()));
    portal.rotateKey();
    const e = await failure(verify(a.path, opts({ json: true }), io(signedIn())));
    expect(e.exitCode).toBe(1);
    const json = JSON.parse(outs[1]);
    expect(json.ok).toBe(false);
    expect(json.problems).toEqual([]);
    expect(json.log.checks.filter((c: { ok: boolean }) => !c.ok).map((c: { name: string }) => c.name)).toEqual(['signing-key', 'head-signature']);
    expect(e.message).toMatch(/signing-key: the portal signs with key [0-9a-f]{16} now, but key [0-9a-f]{16} was pinned on \d{4}-\d\d-\d\d/);
  });
});

describe('localis verify --log', () => {
  it('should check and save the head, then prove the log only grew since', async () => {
    portal.appendRecord();
    portal.appendRecord();
    await verify(undefined, opts({ log: true }), io(signedIn()));
    expect(outs[0]).toMatch(/^Provenance log of http:\/\/127\.0\.0\.1:\d+: 2 entries, root [0-9a-f]{64}\n/);
    expect(outs[0]).toMatch(/ {2}ok {4}the head of 2 entries .* is signed by key/);
    expect(outs[0]).toContain(`  --    no saved head for this portal in ${defaultHeadPath(signedIn())} yet`);
    expect(outs[0]).toContain(`  --    saved the head of 2 entries to ${defaultHeadPath(signedIn())}`);

    for (let i = 0; i < 5; i++) portal.appendRecord();
    await verify(undefined, opts({ log: true }), io(signedIn()));
    expect(outs[1]).toMatch(/ {2}ok {4}consistent with the saved head of 2 entries \(.*\): the log only grew, by 5 entries \(consistency proof of \d+ hashes\)/);
    const saved = JSON.parse(readFileSync(defaultHeadPath(signedIn()), 'utf8'));
    expect(saved.heads[portal.url].treeSize).toBe(7);

    await verify(undefined, opts({ log: true, json: true }), io(signedIn()));
    expect(JSON.parse(outs[2])).toMatchObject({ ok: true, head: { treeSize: 7 }, saved: { treeSize: 7 } });
  });

  it('should fail, and keep the saved head, when the saved root is not in the log', async () => {
    portal.appendRecord();
    portal.appendRecord();
    const headFile = join(config.dir, 'team-head.json');
    await verify(undefined, opts({ log: true, head: headFile }), io(signedIn()));
    const saved = JSON.parse(readFileSync(headFile, 'utf8'));
    expect(saved.treeSize).toBe(2);
    const altered = { ...saved, rootHash: 'f'.repeat(64) };
    writeFileSync(headFile, JSON.stringify(altered));
    portal.appendRecord();
    const e = await failure(verify(undefined, opts({ log: true, head: headFile }), io(signedIn())));
    expect(e.exitCode).toBe(1);
    expect(e.message).toMatch(/^the provenance log check failed:\n {2}saved-head-root: the portal's head of 2 entries has root [0-9a-f]{12}…, the saved one f{12}…: the log was rewritten since it was saved\n {2}consistency: /);
    expect(e.hint).toBe(`The saved head in ${headFile} was kept.`);
    expect(JSON.parse(readFileSync(headFile, 'utf8'))).toEqual(altered);
  });

  it('should need a sign-in, exit code 3', async () => {
    expect((await failure(verify(undefined, opts({ log: true }), io(offline())))).exitCode).toBe(3);
  });
});
