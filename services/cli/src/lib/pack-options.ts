import { statSync } from 'node:fs';
import { basename, dirname, relative, resolve, isAbsolute } from 'node:path';
import { ArchiveManifest, detailsFromZod, formatOfFileName, type ErrorDetail } from '@localis/shared';
import type { ResultArchiveFormat } from '@localis/shared/node';
import { CliError, EXIT } from './cli-error';

/** The options of `localis pack` as commander hands them over (text). */
export interface PackOptions {
  campaign?: string;
  codeName?: string;
  codeVersion?: string;
  codeCommit?: string;
  machine?: string;
  sizes?: string;
  disorder?: string;
  energies?: string;
  realizations?: string;
  seeds?: string;
  runs?: string;
  format?: string;
  out?: string;
  json: boolean;
}

export type ManifestInput = Omit<ArchiveManifest, 'files' | 'formatVersion'>;

export interface PackPlan {
  /** Absolute path of the folder. */
  dir: string;
  /** Absolute path of the archive to write. */
  out: string;
  format: ResultArchiveFormat;
  manifest: ManifestInput;
  json: boolean;
}

const FORMATS: readonly ResultArchiveFormat[] = ['tar.gz', 'tar', 'zip'];
const EXTENSION: Record<ResultArchiveFormat, string> = { 'tar.gz': '.tar.gz', tar: '.tar', zip: '.zip' };

/** The manifest without its files, as packArchive takes it: the schema, minus what packing fills in. */
const ManifestFields = ArchiveManifest.omit({ files: true, formatVersion: true });

/** Which option gives which manifest field, so a problem is reported with the option the person typed. */
const OPTION_OF: Record<string, string> = {
  campaignId: '--campaign',
  runIds: '--runs',
  'code.name': '--code-name',
  'code.version': '--code-version',
  'code.commit': '--code-commit',
  machine: '--machine',
  'parameters.sizes': '--sizes',
  'parameters.disorder': '--disorder',
  'parameters.energies': '--energies',
  'parameters.realizations': '--realizations',
  'parameters.seeds': '--seeds',
};
const REQUIRED: (keyof PackOptions)[] = ['campaign', 'codeName', 'codeVersion', 'codeCommit', 'machine', 'sizes', 'disorder', 'energies', 'realizations'];
const flagOf = (name: string) => `--${name.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`;

/** A decimal number as people type it; Number() alone would take "", "0x10" and "Infinity". */
const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

function numberList(text: string | undefined, option: string, field: string[], problems: ErrorDetail[]): number[] {
  if (text === undefined) return [];
  const items = text.split(/[\s,;]+/).filter(Boolean);
  items.forEach((item, i) => {
    if (!DECIMAL.test(item)) problems.push({ path: [...field, i], message: `"${item}" is not a number (${option} "${text}")` });
  });
  return items.filter((item) => DECIMAL.test(item)).map(Number);
}

/** Everything `localis pack` needs, checked before any file is read: each mistake named with its option. */
export function planPack(dirArg: string, opts: PackOptions, now: Date = new Date()): PackPlan {
  const missing = REQUIRED.filter((name) => opts[name] === undefined);
  if (missing.length) {
    throw new CliError(`a manifest needs ${missing.map(flagOf).join(', ')}.`, { exitCode: EXIT.usage, hint: 'See `localis pack --help` for an example.' });
  }

  const problems: ErrorDetail[] = [];
  const realizationsText = opts.realizations!.trim();
  const candidate = {
    campaignId: opts.campaign!.trim().toLowerCase(),
    runIds: (opts.runs ?? '').split(/[\s,;]+/).filter(Boolean).map((r) => r.toLowerCase()),
    code: { name: opts.codeName!, version: opts.codeVersion!, commit: opts.codeCommit!.trim().toLowerCase() },
    machine: opts.machine!,
    parameters: {
      sizes: numberList(opts.sizes, '--sizes', ['parameters', 'sizes'], problems),
      disorder: numberList(opts.disorder, '--disorder', ['parameters', 'disorder'], problems),
      energies: numberList(opts.energies, '--energies', ['parameters', 'energies'], problems),
      realizations: DECIMAL.test(realizationsText) ? Number(realizationsText) : realizationsText,
      seeds: numberList(opts.seeds, '--seeds', ['parameters', 'seeds'], problems),
    },
    createdAt: now.toISOString(),
  };
  const parsed = ManifestFields.safeParse(candidate);
  if (!parsed.success || problems.length) {
    const schemaProblems = parsed.success ? [] : detailsFromZod(parsed.error).map((d) => withOption(d, opts));
    throw new CliError('the manifest would not be valid; nothing was written:', {
      exitCode: EXIT.usage,
      details: [...problems, ...schemaProblems],
      hint: 'The options and an example are in `localis pack --help`.',
    });
  }

  const dir = resolve(dirArg);
  let info;
  try {
    info = statSync(dir);
  } catch {
    throw new CliError(`cannot read the folder ${dirArg}: no such folder.`);
  }
  if (!info.isDirectory()) throw new CliError(`${dirArg} is not a folder; give the folder of results to pack.`, { exitCode: EXIT.usage });

  const { format, out } = formatAndOut(dir, opts);
  const inside = relative(dir, out);
  if (!inside.startsWith('..') && !isAbsolute(inside)) {
    throw new CliError(`--out ${opts.out} is inside the folder being packed; write the archive beside it (an old archive would be packed into the new one).`, { exitCode: EXIT.usage });
  }
  return { dir, out, format, manifest: parsed.data as ManifestInput, json: opts.json };
}

function formatAndOut(dir: string, opts: PackOptions): { format: ResultArchiveFormat; out: string } {
  let format: ResultArchiveFormat | undefined;
  if (opts.format !== undefined) {
    if (!(FORMATS as readonly string[]).includes(opts.format)) {
      throw new CliError(`--format "${opts.format}" is not an archive format; give tar.gz, tar or zip.`, { exitCode: EXIT.usage });
    }
    format = opts.format as ResultArchiveFormat;
  }
  if (opts.out === undefined) {
    const chosen = format ?? 'tar.gz';
    // Beside the folder, named after it: results/ -> results.tar.gz.
    return { format: chosen, out: resolve(dirname(dir), `${basename(dir)}${EXTENSION[chosen]}`) };
  }
  const named = formatOfFileName(basename(opts.out));
  if (named !== 'tar.gz' && named !== 'tar' && named !== 'zip') {
    throw new CliError(`--out ${opts.out}: an archive's name ends in .tar.gz, .tgz, .tar or .zip (the portal tells the format from it).`, { exitCode: EXIT.usage });
  }
  if (format && named !== format) throw new CliError(`--out ${opts.out} names a .${named} file, but --format is ${format}.`, { exitCode: EXIT.usage });
  return { format: named, out: resolve(opts.out) };
}

function withOption(detail: ErrorDetail, opts: PackOptions): ErrorDetail {
  const key = detail.path.filter((p) => typeof p === 'string').join('.');
  const option = OPTION_OF[key];
  if (!option) return detail;
  const text = textOf(key, opts);
  return { ...detail, message: `${detail.message} (${option}${text === undefined ? '' : ` "${text}"`})` };
}

function textOf(field: string, opts: PackOptions): string | undefined {
  const byField: Record<string, string | undefined> = {
    campaignId: opts.campaign,
    runIds: opts.runs,
    'code.name': opts.codeName,
    'code.version': opts.codeVersion,
    'code.commit': opts.codeCommit,
    machine: opts.machine,
    'parameters.sizes': opts.sizes,
    'parameters.disorder': opts.disorder,
    'parameters.energies': opts.energies,
    'parameters.realizations': opts.realizations,
    'parameters.seeds': opts.seeds,
  };
  return byField[field];
}
