import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ArchiveManifest } from '@localis/shared';
import { runCli, tempConfigDir } from '../../test/cli-harness';

// The real `localis pack` in a child process; offline, with LOCALIS_URL at a closed port so a stray
// call to the portal would fail it.

let config: ReturnType<typeof tempConfigDir>;
let results: string;
beforeEach(() => {
  config = tempConfigDir();
  results = join(config.dir, 'results');
  mkdirSync(join(results, 'raw'), { recursive: true });
  writeFileSync(join(results, 'lambda.csv'), 'L,W,E,lambda,lambda_err\n8,17,0,0.5821,0.0012\n12,17,0,0.5710,0.0013\n');
  writeFileSync(join(results, 'raw', 'seed-1.bin'), Buffer.alloc(70_000, 3));
});
afterEach(() => config.remove());

const CAMPAIGN = '3f1c9a52-7d4e-4b8a-9c61-2e5f0a7b8d90';
const MANIFEST_OPTIONS = [
  '--campaign', CAMPAIGN, '--code-name', 'tmm-anderson', '--code-version', '2.3.1', '--code-commit', '9f3e2a1c', '--machine', 'fjell',
  '--sizes', '8,12', '--disorder', '17', '--energies', '0', '--realizations', '100', '--seeds', '1,2',
];
const pack = (args: string[]) => runCli(['pack', ...args], { configDir: config.dir, env: { LOCALIS_URL: 'http://127.0.0.1:4' } });

describe('localis pack', () => {
  it('should write the archive beside the folder and print its path, size and SHA-256', async () => {
    const r = await pack([results, ...MANIFEST_OPTIONS]);
    expect(r.code, r.stderr).toBe(0);
    const archive = `${results}.tar.gz`;
    const sha256 = createHash('sha256').update(readFileSync(archive)).digest('hex');
    expect(r.stdout).toContain('Packed 2 files (68.4 KiB) and manifest.json\n');
    expect(r.stdout).toContain(`  archive   ${archive}\n`);
    expect(r.stdout).toContain(`  size      `);
    expect(r.stdout).toContain(`(${statSync(archive).size.toLocaleString('en')} bytes)\n`);
    expect(r.stdout).toContain(`  SHA-256   ${sha256}\n`);
    expect(r.stdout).toContain(`Next: localis verify ${archive}`);
    // No partial file is left beside it.
    expect(readdirSync(config.dir).filter((n) => n.includes('partial'))).toEqual([]);
  });

  it('should print the manifest with --json, listing every file with its size and hash', async () => {
    const r = await pack([results, ...MANIFEST_OPTIONS, '--runs', 'a1b2c3d4-0001-4e5f-8a9b-0c1d2e3f4a5b', '--format', 'zip', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const json = JSON.parse(r.stdout);
    expect(json).toMatchObject({ path: `${results}.zip`, format: 'zip', sizeBytes: statSync(`${results}.zip`).size });
    const manifest = ArchiveManifest.parse(json.manifest);
    expect(manifest.runIds).toEqual(['a1b2c3d4-0001-4e5f-8a9b-0c1d2e3f4a5b']);
    expect(manifest.files.map((f) => [f.path, f.sizeBytes])).toEqual([
      ['lambda.csv', 67],
      ['raw/seed-1.bin', 70_000],
    ]);
    expect(manifest.files[1].sha256).toBe(createHash('sha256').update(Buffer.alloc(70_000, 3)).digest('hex'));
  });

  it('should name each option that is not valid, exit 2 and write nothing', async () => {
    const r = await pack([results, ...MANIFEST_OPTIONS.map((o) => (o === '9f3e2a1c' ? 'not-hex' : o === '8,12' ? '8,twelve' : o))]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('localis: the manifest would not be valid; nothing was written:\n');
    expect(r.stderr).toContain('  parameters.sizes[1]: "twelve" is not a number (--sizes "8,twelve")\n');
    expect(r.stderr).toContain('  code.commit: code.commit is a hexadecimal commit id of 7 to 64 digits (--code-commit "not-hex")\n');
    expect(existsSync(`${results}.tar.gz`)).toBe(false);
  });

  it('should refuse a folder without a result table', async () => {
    const empty = join(config.dir, 'no-tables');
    mkdirSync(empty);
    writeFileSync(join(empty, 'log.txt'), 'hello');
    const r = await pack([empty, ...MANIFEST_OPTIONS]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('holds no .csv result table');
  });
});
