import { stat } from 'node:fs/promises';
import { basename, resolve } from 'node:path';
import { z } from 'zod';
import { ARCHIVE_KINDS, FORMATS_OF_KIND, formatOfFileName, MAX_ARCHIVE_BYTES, MAX_ATTACHMENT_BYTES, type ArchiveKind } from '@localis/shared';
import { CliError, EXIT } from './cli-error';
import { checkCampaignId } from './run-input';
import { formatSize } from './upload-format';

/** The options of `localis upload` as commander hands them over. */
export interface UploadOptions {
  campaign: string;
  /** `--run`, repeated or separated by commas. */
  run?: string[];
  kind: string;
  json: boolean;
  stats: boolean;
  /** false with `--no-wait`. */
  wait: boolean;
  parallel: string;
  limitRate?: string;
  profile: string;
}

/** What an upload needs to know before it talks to the portal, all checked. */
export interface UploadPlan {
  /** Absolute path. */
  path: string;
  fileName: string;
  sizeBytes: number;
  mtimeMs: number;
  campaignId: string;
  kind: ArchiveKind;
  runIds: string[];
  parallel: number;
  /** Bytes per second, or undefined for no limit. */
  limitBytesPerSecond?: number;
  wait: boolean;
  json: boolean;
  stats: boolean;
}

export const MAX_PARALLEL = 16;
const RunId = z.uuid();

/** Collects `--run a --run b,c` into [a, b, c]. */
export function collectRuns(value: string, previous: string[] = []): string[] {
  return [...previous, ...value.split(/[\s,;]+/).filter(Boolean)];
}

/**
 * Every mistake that can be seen without the portal, seen before anything is sent: a typo in the
 * campaign id should not cost a half-made upload.
 */
export async function planUpload(archivePath: string, opts: UploadOptions): Promise<UploadPlan> {
  const campaignId = checkCampaignId(opts.campaign);
  if (!(ARCHIVE_KINDS as readonly string[]).includes(opts.kind)) {
    throw new CliError(`--kind "${opts.kind}" is not a kind of upload; give one of ${ARCHIVE_KINDS.join(', ')}.`, { exitCode: EXIT.usage });
  }
  const kind = opts.kind as ArchiveKind;
  const runIds = [...new Set((opts.run ?? []).map((r) => r.trim().toLowerCase()))];
  const badRuns = runIds.filter((r) => !RunId.safeParse(r).success);
  if (badRuns.length) {
    throw new CliError(`--run takes run ids (UUIDs, as \`localis runs list --json\` prints them); these are not: ${badRuns.map((r) => `"${r}"`).join(', ')}.`, { exitCode: EXIT.usage });
  }
  if (runIds.length && kind !== 'results') throw new CliError('only result archives name runs; leave out --run for an attachment.', { exitCode: EXIT.usage });

  const parallel = Number(opts.parallel);
  if (!/^\d+$/.test(opts.parallel.trim()) || parallel < 1 || parallel > MAX_PARALLEL) {
    throw new CliError(`--parallel takes a whole number of parts from 1 to ${MAX_PARALLEL} (read "${opts.parallel}").`, { exitCode: EXIT.usage });
  }
  let limitBytesPerSecond: number | undefined;
  if (opts.limitRate !== undefined) {
    const mb = Number(opts.limitRate);
    if (!/^\s*(\d+(\.\d*)?|\.\d+)\s*$/.test(opts.limitRate) || !(mb > 0)) {
      throw new CliError(`--limit-rate takes megabytes per second, a number above 0, e.g. 50 (read "${opts.limitRate}").`, { exitCode: EXIT.usage });
    }
    limitBytesPerSecond = mb * 1e6;
  }

  const path = resolve(archivePath);
  const fileName = basename(path);
  const format = formatOfFileName(fileName);
  if (!format || !FORMATS_OF_KIND[kind].includes(format)) {
    const allowed = FORMATS_OF_KIND[kind].map((f) => `.${f}`).join(', ');
    throw new CliError(`${fileName} cannot be uploaded as ${kind === 'results' ? 'a result archive' : `a ${kind} attachment`}: its name must end in ${allowed}${kind === 'results' ? ' (or .tgz)' : ''}.`, {
      exitCode: EXIT.usage,
      hint: kind === 'results' ? '`localis pack` writes a result archive from a folder of results.' : undefined,
    });
  }
  let info;
  try {
    info = await stat(path);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new CliError(`cannot read ${archivePath}: ${code === 'ENOENT' ? 'no such file' : code === 'EACCES' ? 'permission denied' : (e as Error).message}.`, { cause: e });
  }
  if (!info.isFile()) throw new CliError(`${archivePath} is not a regular file.`, { exitCode: EXIT.usage });
  if (info.size === 0) throw new CliError(`${archivePath} is empty; there is nothing to upload.`, { exitCode: EXIT.usage });
  const max = kind === 'results' ? MAX_ARCHIVE_BYTES : MAX_ATTACHMENT_BYTES;
  if (info.size > max) throw new CliError(`${archivePath} has ${formatSize(info.size)}; ${kind === 'results' ? 'an archive' : 'an attachment'} may be at most ${formatSize(max)}.`, { exitCode: EXIT.usage });

  return {
    path,
    fileName,
    sizeBytes: info.size,
    mtimeMs: info.mtimeMs,
    campaignId,
    kind,
    runIds,
    parallel,
    limitBytesPerSecond,
    wait: opts.wait,
    json: opts.json,
    stats: opts.stats,
  };
}
