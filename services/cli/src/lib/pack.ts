import { readdirSync, renameSync, rmSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { packArchive } from '@localis/shared/node';
import { CliError, EXIT } from './cli-error';
import { terminalOutput, type Output } from './output';
import { planPack, type PackOptions, type PackPlan } from './pack-options';
import { formatSize } from './upload-format';
import { sha256OfFile } from './upload-hash';

export interface PackIo {
  out: Output;
  stderr: NodeJS.WriteStream;
  signals?: NodeJS.EventEmitter;
}

const defaultIo = (): PackIo => ({ out: terminalOutput, stderr: process.stderr, signals: process });

/** The regular files packArchive will take (it leaves out links and special files, and replaces manifest.json). */
export function filesToPack(dir: string): { count: number; bytes: number; tables: number } {
  let count = 0;
  let bytes = 0;
  let tables = 0;
  const walk = (folder: string) => {
    for (const entry of readdirSync(folder, { withFileTypes: true })) {
      const path = join(folder, entry.name);
      if (entry.isDirectory()) walk(path);
      else if (entry.isFile() && relative(dir, path) !== 'manifest.json') {
        count++;
        bytes += statSync(path).size;
        if (entry.name.toLowerCase().endsWith('.csv')) tables++;
      }
    }
  };
  walk(dir);
  return { count, bytes, tables };
}

/**
 * `localis pack`: a result archive from a folder, with the manifest the portal's check expects
 * (every file with its size and SHA-256, the campaign, runs, code and grid), written by the same
 * shared code the tests of the checker use. The archive is written under a temporary name and
 * renamed when complete, so an interrupted pack never leaves a half archive under the real name.
 */
export async function pack(dirArg: string, opts: PackOptions, io: PackIo = defaultIo()): Promise<void> {
  const plan = planPack(dirArg, opts);
  const found = filesToPack(plan.dir);
  if (found.count === 0) throw new CliError(`${dirArg} holds no files to pack.`, { exitCode: EXIT.usage });
  if (found.tables === 0) {
    throw new CliError(`${dirArg} holds no .csv result table; the portal's check needs one (header L,W,E,lambda,lambda_err or L,W,E,g,g_err).`, { exitCode: EXIT.usage });
  }

  const partial = `${plan.out}.partial-${process.pid}`;
  const signals = io.signals ?? process;
  const onSigint = () => {
    rmSync(partial, { force: true });
    io.stderr.write('\r\x1b[Klocalis: cancelled; no archive was written.\n');
    process.exit(EXIT.interrupted);
  };
  signals.on('SIGINT', onSigint);
  const line = !plan.json && io.stderr.isTTY ? io.stderr : null;
  let hashed = 0;
  let files = 0;
  try {
    const manifest = await packArchive({
      dir: plan.dir,
      out: partial,
      format: plan.format,
      manifest: plan.manifest,
      onFile: (_path, sizeBytes) => {
        hashed += sizeBytes;
        files += 1;
        line?.write(`\rlocalis: hashed ${files} of ${found.count} files (${formatSize(hashed)} of ${formatSize(found.bytes)}); then writing the archive\x1b[K`);
      },
    });
    line?.write('\r\x1b[K');
    renameSync(partial, plan.out);
    const sizeBytes = statSync(plan.out).size;
    const sha256 = await sha256OfFile(plan.out);
    if (plan.json) io.out.out(JSON.stringify({ path: plan.out, format: plan.format, sizeBytes, sha256, manifest }, null, 2));
    else io.out.out(formatPacked(plan, manifest.files.length, found.bytes, sizeBytes, sha256));
  } catch (e) {
    line?.write('\r\x1b[K');
    rmSync(partial, { force: true });
    if (e instanceof CliError) throw e;
    throw new CliError(`cannot pack ${dirArg}: ${(e as Error).message}`, { cause: e });
  } finally {
    signals.off('SIGINT', onSigint);
  }
}

function formatPacked(plan: PackPlan, fileCount: number, filesBytes: number, sizeBytes: number, sha256: string): string {
  const m = plan.manifest;
  const runs = m.runIds.length ? ` ${m.runIds.map((r) => `--run ${r}`).join(' ')}` : '';
  return [
    `Packed ${fileCount} ${fileCount === 1 ? 'file' : 'files'} (${formatSize(filesBytes)}) and manifest.json`,
    `  archive   ${plan.out}`,
    `  size      ${formatSize(sizeBytes)} (${sizeBytes.toLocaleString('en')} bytes)`,
    `  SHA-256   ${sha256}`,
    `  manifest  campaign ${m.campaignId}, ${m.runIds.length} ${m.runIds.length === 1 ? 'run' : 'runs'}, ${m.code.name} ${m.code.version} (${m.code.commit}) on ${m.machine}`,
    `Next: localis verify ${plan.out}`,
    `      localis upload ${plan.out} --campaign ${m.campaignId}${runs}`,
  ].join('\n');
}
