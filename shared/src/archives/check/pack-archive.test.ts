import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, rm, symlink, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FIXTURE_CAMPAIGN_ID, FIXTURE_RUN_IDS, FIXTURE_SPEC, lambdaTable, sha256Hex } from './archive-fixtures';
import { localFileSource } from './archive-source';
import { checkArchive } from './check-archive';
import { packArchive, type PackArchiveOptions } from './pack-archive';

const MANIFEST: PackArchiveOptions['manifest'] = {
  campaignId: FIXTURE_CAMPAIGN_ID,
  runIds: FIXTURE_RUN_IDS,
  code: { name: 'tmm-anderson', version: '2.3.1', commit: '9f3e2a1c' },
  machine: 'cluster-a',
  parameters: { sizes: FIXTURE_SPEC.sizes, disorder: [15, 15.5, 16, 16.5, 17, 17.5, 18], energies: [0], realizations: 200, seeds: [11, 12] },
};

describe('packArchive', () => {
  let dir: string;
  let results: string;
  const raw = Buffer.from(Array.from({ length: 300_000 }, (_, i) => (i * 131) & 0xff));

  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'localis-pack-'));
    results = join(dir, 'results');
    await mkdir(join(results, 'raw', 'L10'), { recursive: true });
    await writeFile(join(results, 'lambda.csv'), lambdaTable(FIXTURE_SPEC).text);
    await writeFile(join(results, 'raw', 'L10', 'run-2.bin'), raw);
    await writeFile(join(results, 'raw', 'run-1.log'), 'converged\n');
    await writeFile(join(results, 'manifest.json'), '{"stale": true}'); // replaced by the one packed
    await symlink('/etc/hostname', join(results, 'raw', 'link')); // left out: the checker refuses links
  });
  afterAll(() => rm(dir, { recursive: true, force: true }));

  it.each(['tar.gz', 'tar', 'zip'] as const)('%s: pack then check round trip', async (format) => {
    const out = join(dir, `out.${format}`);
    const manifest = await packArchive({ dir: results, out, format, manifest: MANIFEST });
    expect(manifest.formatVersion).toBe(1);
    expect(manifest.files.map((f) => f.path)).toEqual(['lambda.csv', 'raw/L10/run-2.bin', 'raw/run-1.log']);
    expect(manifest.files[1]).toEqual({ path: 'raw/L10/run-2.bin', sizeBytes: raw.length, sha256: sha256Hex(raw) });
    const result = await checkArchive(await localFileSource(out), {
      campaign: { id: FIXTURE_CAMPAIGN_ID, machine: 'cluster-a', spec: FIXTURE_SPEC, runIds: new Set(FIXTURE_RUN_IDS) },
    });
    expect(result.problems).toEqual([]);
    expect(result.manifest).toEqual(manifest);
    expect(result.entries).toBe(4);
    expect(result.tables[0]).toMatchObject({ path: 'lambda.csv', kind: 'lambda' });
  });

  it('leaves out the archive it is writing when that lies inside the folder', async () => {
    const out = join(results, 'inside.tar');
    const manifest = await packArchive({ dir: results, out, format: 'tar', manifest: MANIFEST });
    expect(manifest.files.map((f) => f.path)).not.toContain('inside.tar');
    await rm(out);
  });

  it('refuses to write an invalid manifest, and writes nothing', async () => {
    const out = join(dir, 'bad.tar.gz');
    await expect(packArchive({ dir: results, out, format: 'tar.gz', manifest: { ...MANIFEST, campaignId: 'nope', machine: 'Cluster A' } })).rejects.toThrow(
      /campaignId: campaignId must be the campaign id[\s\S]*machine: machine names are/,
    );
    expect(existsSync(out)).toBe(false);
  });
});
