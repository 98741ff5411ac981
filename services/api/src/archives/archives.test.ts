import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RunInput, type Archive, type ConsistencyProof, type ProvenanceEntryList, type ProvenanceEntryWithProof, type SignedTreeHead, type SigningKey, type StoredParts } from '@localis/shared';
import { buildArchive, goodArchive, leafHash, verifyInclusion, verifyTreeHead, verifyConsistency } from '@localis/shared/node';
import { startTestApp, type TestApp } from '../../test/harness';
import { actingAs, makeCampaignWorld, type CampaignWorld } from '../../test/campaign-world';
import { complete, sendParts, sha256Of, startUpload, uploadArchive, type ApiCall, bearerCaller } from '../../test/archive-upload';
import { ArchiveBusy, createArchiveVerifier, type ArchiveVerifier } from './archive-verification';
import { ArchiveRow, ProvenanceEntryRow } from '../db/models';
import { abandonStaleUploads } from './abandoned-uploads';

let t: TestApp;
let w: CampaignWorld;
let campaignId: string;
let runIds: string[];
let verifier: ArchiveVerifier;

const caller = (token: string): ApiCall => bearerCaller(t.url, token);
let researcher: ApiCall;
let pi: ApiCall;
let outsider: ApiCall;

const SPEC = { sizes: [8, 12], disorder: { values: [15.5, 16.5, 17.5] }, energies: [0] };
const goodFor = (opts: Parameters<typeof goodArchive>[0] = {}) => goodArchive({ campaignId, runIds, machine: w.machine, spec: SPEC, ...opts });

/**
 * Check an archive in this process and answer its final state. The test stack's worker may take
 * the same archive through the outbox first; then this waits for it instead.
 */
async function settle(id: string): Promise<Archive['state']> {
  await verifier.verify(id).catch((e) => {
    if (!(e instanceof ArchiveBusy)) throw e;
  });
  let a = (await ArchiveRow.findByPk(id))!;
  for (let i = 0; i < 300 && (a.state === 'received' || a.state === 'checking'); i++) {
    await new Promise((r) => setTimeout(r, 100));
    a = (await ArchiveRow.findByPk(id))!;
  }
  return a.state;
}

async function get<T>(call: ApiCall, path: string): Promise<T> {
  const res = await call('GET', path);
  expect(res.status, await res.clone().text()).toBe(200);
  return (await res.json()) as T;
}

beforeAll(async () => {
  t = await startTestApp({ TOKEN_RATE_PER_MINUTE: '100000' });
  w = await makeCampaignWorld(t, { label: 'archives' });
  campaignId = await w.granted(100_000);
  researcher = caller(w.tokens.researcher);
  pi = caller(w.tokens.pi);
  outsider = caller(w.tokens.outsider);
  runIds = [];
  for (const n of [1, 2]) {
    const run = await t.services.runs.create(actingAs(w.researcher), campaignId, RunInput.parse({
      externalJobId: `archives-${Date.now()}-${n}`, machine: w.machine, startedAt: '2027-02-01T08:00:00Z', endedAt: '2027-02-01T20:00:00Z', cores: 64, codeName: 'tmm-anderson', codeVersion: '2.3.1',
    }));
    runIds.push(run.id);
  }
  verifier = createArchiveVerifier(t.db, t.services.objectStore);
}, 120_000);
afterAll(async () => t.close());

describe('uploading an archive in parts', () => {
  it('should plan parts, list what the store holds, resume, and receive the archive once complete', async () => {
    // 20 MiB of raw data beside the table: three parts of 8 MiB.
    const raw = Buffer.alloc(20 * 1024 * 1024, 7);
    const { archive } = await goodFor({ format: 'tar', extraFiles: [{ name: 'raw/bars.bin', content: raw }] });
    const upload = await startUpload(researcher, campaignId, 'bars.tar', archive, { runIds });
    expect(upload.partCount).toBe(3);
    expect(upload.partSizeBytes).toBe(8 * 1024 * 1024);
    expect(upload.archive.state).toBe('uploading');

    await sendParts(researcher, upload, archive, [1, 3]);
    // A reload: the uploader asks what is stored and sends only the rest.
    expect((await get<StoredParts>(researcher, `/archives/${upload.archive.id}/parts`)).parts.map((p) => p.partNumber)).toEqual([1, 3]);
    const early = await complete(researcher, upload.archive.id, sha256Of(archive));
    expect(early.status).toBe(409);
    expect((await early.json()).error.message).toMatch(/1 of 3 parts are not stored yet \(2\)/);

    await sendParts(researcher, upload, archive, [2]);
    const done = await complete(researcher, upload.archive.id, sha256Of(archive));
    expect(done.status).toBe(200);
    const received = (await done.json()) as Archive;
    expect(received).toMatchObject({ state: 'received', declaredSha256: sha256Of(archive), sizeBytes: archive.length });
    // Completing again with the same hash answers the same; with another hash, a conflict.
    expect((await complete(researcher, upload.archive.id, sha256Of(archive))).status).toBe(200);
    expect((await complete(researcher, upload.archive.id, 'b'.repeat(64))).status).toBe(409);
    // Parts can no longer be sent.
    expect((await researcher('POST', `/archives/${upload.archive.id}/part-urls`, { partNumbers: [1] })).status).toBe(409);

    expect(await settle(upload.archive.id)).toBe('verified');
    const verified = await get<Archive>(researcher, `/archives/${upload.archive.id}`);
    expect(verified.state).toBe('verified');
    expect(verified.manifest?.runIds).toEqual(runIds);
    // The stored object is the uploaded file, byte for byte (downloaded through a presigned URL).
    const link = await get<{ url: string }>(researcher, `/archives/${upload.archive.id}/download`);
    const downloaded = Buffer.from(await (await fetch(link.url)).arrayBuffer());
    expect(sha256Of(downloaded)).toBe(sha256Of(archive));
    // A second run of the job changes nothing.
    expect(await verifier.verify(upload.archive.id)).toBe('skipped');
  });

  it('should refuse bad requests with what to fix', async () => {
    const bad = await researcher('POST', `/campaigns/${campaignId}/archives`, { kind: 'results', fileName: 'results.rar', sizeBytes: 10 });
    expect(bad.status).toBe(422);
    expect(JSON.stringify(await bad.json())).toMatch(/\.tar\.gz, \.tgz, \.tar or \.zip/);
    const stranger = await researcher('POST', `/campaigns/${campaignId}/archives`, { kind: 'results', fileName: 'r.tar.gz', sizeBytes: 10, runIds: ['00000000-0000-4000-8000-000000000000'] });
    expect(stranger.status).toBe(422);
    expect(JSON.stringify(await stranger.json())).toMatch(/is not a run of/);
    const submitted = await w.submitted('Not granted yet');
    const early = await researcher('POST', `/campaigns/${submitted}/archives`, { kind: 'results', fileName: 'r.tar.gz', sizeBytes: 10 });
    expect(early.status).toBe(409);
    // Another group's PI does not see the campaign at all.
    expect((await outsider('POST', `/campaigns/${campaignId}/archives`, { kind: 'results', fileName: 'r.tar.gz', sizeBytes: 10 })).status).toBe(404);
    const upload = await startUpload(researcher, campaignId, 'two.tar.gz', Buffer.alloc(10));
    expect((await researcher('POST', `/archives/${upload.archive.id}/part-urls`, { partNumbers: [2] })).status).toBe(422);
    expect((await outsider('GET', `/archives/${upload.archive.id}`)).status).toBe(404);
  });
});

describe('unfinished uploads', () => {
  it('should end a cancelled upload rejected, with who cancelled it, and drop its parts', async () => {
    const bytes = Buffer.alloc(9 * 1024 * 1024, 1);
    const upload = await startUpload(researcher, campaignId, 'given-up.tar', bytes);
    await sendParts(researcher, upload, bytes, [1]);
    const res = await researcher('POST', `/archives/${upload.archive.id}/cancel`);
    expect(res.status).toBe(200);
    const cancelled = (await res.json()) as Archive;
    expect(cancelled.state).toBe('rejected');
    expect(cancelled.problems).toEqual([{ code: 'upload-cancelled', message: `the upload was cancelled by ${w.researcher.name} before it was complete` }]);
    expect((await researcher('POST', `/archives/${upload.archive.id}/cancel`)).status).toBe(409);
    expect((await researcher('GET', `/archives/${upload.archive.id}/download`)).status).toBe(409);
    expect((await get<StoredParts>(researcher, `/archives/${upload.archive.id}/parts`)).parts).toEqual([]);
  });

  it('should abandon uploads left unfinished for a week (the daily sweep)', async () => {
    const upload = await startUpload(researcher, campaignId, 'forgotten.tar.gz', Buffer.alloc(100));
    await t.db.sequelize.query(`UPDATE archives SET created_at = now() - interval '8 days' WHERE id = '${upload.archive.id}'`);
    expect(await abandonStaleUploads(t.db, t.services.objectStore, new Date())).toBeGreaterThanOrEqual(1);
    const a = await get<Archive>(researcher, `/archives/${upload.archive.id}`);
    expect(a.state).toBe('rejected');
    expect(a.problems[0].code).toBe('upload-abandoned');
    expect(await abandonStaleUploads(t.db, t.services.objectStore, new Date())).toBe(0);
  });
});

describe('verification', () => {
  it('should reject a bad archive with one reason per problem and record nothing in the log', async () => {
    const archive = await buildArchive({
      format: 'tar.gz',
      entries: [
        { name: '../escape.csv', content: 'L,W,E,lambda,lambda_err\n' },
        { name: 'link', type: 'symlink', linkname: '/etc/passwd' },
      ],
    });
    const received = await uploadArchive(researcher, campaignId, 'bad.tar.gz', archive);
    expect(await settle(received.id)).toBe('rejected');
    const rejected = await get<Archive>(researcher, `/archives/${received.id}`);
    expect(rejected.state).toBe('rejected');
    const codes = rejected.problems.map((p) => p.code);
    expect(codes).toEqual(expect.arrayContaining(['unsafe-path', 'link-or-device', 'manifest-missing']));
    expect(await ProvenanceEntryRow.count({ where: { subjectId: received.id } })).toBe(0);
    expect((await ArchiveRow.findByPk(received.id))!.points).toBeNull();
  });

  it('should reject a file that is not what the uploader hashed, and one outside the campaign', async () => {
    const { archive } = await goodFor();
    const wrongHash = await uploadArchive(researcher, campaignId, 'wrong-hash.tar.gz', archive, { sha256: 'c'.repeat(64) });
    expect(await settle(wrongHash.id)).toBe('rejected');
    expect((await get<Archive>(researcher, `/archives/${wrongHash.id}`)).problems.map((p) => p.code)).toContain('checksum-mismatch');

    const { archive: elsewhere } = await goodFor({ spec: { sizes: [8, 96], disorder: { values: [16.5] }, energies: [0] } });
    const outside = await uploadArchive(researcher, campaignId, 'outside.tar.gz', elsewhere);
    expect(await settle(outside.id)).toBe('rejected');
    const problems = (await get<Archive>(researcher, `/archives/${outside.id}`)).problems;
    expect(problems.map((p) => p.code)).toContain('outside-spec');
    expect(problems.map((p) => p.message).join(' ')).toMatch(/96/);
  });
});

describe('the provenance log', () => {
  let archiveId: string;
  let sha256: string;

  beforeAll(async () => {
    const good = await goodFor({ format: 'zip' });
    sha256 = good.sha256;
    archiveId = (await uploadArchive(researcher, campaignId, 'good.zip', good.archive, { runIds })).id;
    expect(await settle(archiveId)).toBe('verified');
  });

  it("should prove a verified archive's entry against a signed head", async () => {
    const key = await get<SigningKey>(researcher, '/provenance/key');
    const { entry, proof } = await get<ProvenanceEntryWithProof>(researcher, `/provenance/archives/${sha256}`);
    expect(entry.kind).toBe('archive-verified');
    expect(entry.subjectId).toBe(archiveId);
    expect(leafHash(entry.content).toString('hex')).toBe(entry.leafHash);
    expect(JSON.parse(entry.content).entities[0].attributes.sha256).toBe(sha256);
    expect(proof).not.toBeNull();
    expect(verifyTreeHead(key.publicKeyPem, proof!.head)).toBe(true);
    expect(verifyInclusion({ leafHash: entry.leafHash, leafIndex: proof!.leafIndex, treeSize: proof!.treeSize, auditPath: proof!.auditPath, rootHash: proof!.head.rootHash })).toBe(true);
    // The archive's lineage names its runs, the code and the uploader.
    const record = entry.record;
    expect(record.wasDerivedFrom.map((d) => d.used)).toEqual(runIds.map((id) => `localis:run-output/${id}`));
    expect(record.agents.map((a) => a.kind).sort()).toEqual(['person', 'software']);
  });

  it('should keep every head consistent with the next', async () => {
    const first = await get<SignedTreeHead>(researcher, '/provenance/head');
    await t.services.runs.create(actingAs(w.researcher), campaignId, RunInput.parse({
      externalJobId: `archives-${Date.now()}-late`, machine: w.machine, startedAt: '2027-02-02T08:00:00Z', endedAt: '2027-02-02T09:00:00Z', cores: 8, codeName: 'tmm-anderson', codeVersion: '2.3.1',
    }));
    const second = await get<SignedTreeHead>(researcher, '/provenance/head');
    expect(second.treeSize).toBeGreaterThan(first.treeSize);
    const proof = await get<ConsistencyProof>(researcher, `/provenance/consistency?from=${first.treeSize}&to=${second.treeSize}`);
    expect(verifyConsistency({ firstSize: first.treeSize, secondSize: second.treeSize, firstRoot: first.rootHash, secondRoot: second.rootHash, path: proof.path })).toBe(true);
    expect((await researcher('GET', `/provenance/consistency?from=${second.treeSize + 1000}`)).status).toBe(422);
  });

  it("should export the campaign's provenance as PROV-JSON, and refuse to change the log", async () => {
    const { items } = await get<ProvenanceEntryList>(researcher, `/campaigns/${campaignId}/provenance`);
    expect(items.map((e) => e.kind)).toEqual(expect.arrayContaining(['grant-decided', 'run-recorded', 'archive-verified']));
    const res = await researcher('GET', `/campaigns/${campaignId}/provenance?format=prov-json`);
    expect(res.headers.get('content-disposition')).toMatch(/attachment; filename="localis-provenance-/);
    const doc = (await res.json()) as Record<string, Record<string, unknown>>;
    expect(Object.keys(doc.entity)).toContain(`localis:archive/${archiveId}`);
    expect(Object.keys(doc.wasDerivedFrom).length).toBeGreaterThanOrEqual(2);
    await expect(t.db.sequelize.query(`UPDATE provenance_entries SET content = 'x' WHERE subject_id = '${archiveId}'`)).rejects.toThrow(/append-only/);
    await expect(t.db.sequelize.query(`DELETE FROM provenance_entries WHERE subject_id = '${archiveId}'`)).rejects.toThrow(/append-only/);
  });

  it('should withdraw an archive with a reason, keep it, and log the withdrawal (the PI or the office only)', async () => {
    const path = `/archives/${archiveId}/withdraw`;
    expect((await researcher('POST', path, { reason: 'the seeds were reused across sizes' })).status).toBe(403);
    expect((await pi('POST', path, { reason: 'short' })).status).toBe(422);
    const res = await pi('POST', path, { reason: 'the seeds were reused across sizes' });
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ state: 'verified', withdrawnReason: 'the seeds were reused across sizes', withdrawnByName: w.pi.name });
    expect((await pi('POST', path, { reason: 'the seeds were reused across sizes' })).status).toBe(409);
    expect(await ProvenanceEntryRow.count({ where: { subjectId: archiveId } })).toBe(2);
    // Still downloadable: withdrawn is a mark, not a deletion.
    expect((await researcher('GET', `/archives/${archiveId}/download`)).status).toBe(200);
  });
});
