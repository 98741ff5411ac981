import { basename } from 'node:path';
import { ConsistencyProof, formatOfFileName, ProvenanceEntryWithProof, SignedTreeHead, SigningKey, type ArchiveProblem } from '@localis/shared';
import { checkArchive, isResultArchiveFormat, localFileSource, type ArchiveCheckResult } from '@localis/shared/node';
import { ApiClient } from './api-client';
import { CliError, EXIT, isCliError } from './cli-error';
import { resolveConnection, type Connection } from './connection';
import { terminalOutput, type Output } from './output';
import { isNotFound } from './upload-api';
import { formatProblem, formatSize } from './upload-format';
import { sha256OfFile } from './upload-hash';
import { formatArchiveReport, formatLogReport, type LogReport } from './verify-format';
import { checkArchiveEntry, checkConsistency, checkHeadSignature, type LogCheck } from './verify-log';
import { offlineContext, offlineProblems, readOfflineCampaign, type OfflineCampaign } from './verify-spec';
import { defaultHeadPath, pinKey, readSavedHead, saveHead, type PinOutcome } from './verify-trust';

export interface VerifyOptions {
  campaignSpec?: string;
  log: boolean;
  head?: string;
  offline: boolean;
  requireLog: boolean;
  json: boolean;
  profile: string;
}

export interface VerifyIo {
  out: Output;
  stderr: NodeJS.WriteStream;
  env: NodeJS.ProcessEnv;
  signals?: NodeJS.EventEmitter;
}

const defaultIo = (): VerifyIo => ({ out: terminalOutput, stderr: process.stderr, env: process.env, signals: process });

/** `localis verify <archive>` or `localis verify --log`. */
export async function verify(archivePath: string | undefined, opts: VerifyOptions, io: VerifyIo = defaultIo()): Promise<void> {
  if (opts.log && archivePath !== undefined) {
    throw new CliError('give either an archive to verify or --log, not both.', { exitCode: EXIT.usage, hint: 'Run `localis verify <archive>` and `localis verify --log` one after the other.' });
  }
  if (opts.log) return verifyLog(opts, io);
  if (archivePath === undefined) throw new CliError('give the archive to verify, or --log to check the provenance log.', { exitCode: EXIT.usage });
  if (opts.head !== undefined) throw new CliError('--head goes with --log.', { exitCode: EXIT.usage });
  return verifyArchive(archivePath, opts, io);
}

/** The portal this command may talk to: null when none is configured (no stored token, no LOCALIS_TOKEN). */
function configuredConnection(profile: string, env: NodeJS.ProcessEnv): Connection | null {
  try {
    return resolveConnection({ profile }, env);
  } catch (e) {
    if (isCliError(e) && e.exitCode === EXIT.notSignedIn) return null;
    throw e;
  }
}

/** Ctrl-C stops a long check with exit code 130. */
function cancelOnSigint(io: VerifyIo) {
  const controller = new AbortController();
  const onSigint = () => controller.abort(new CliError('cancelled; the archive was not checked to the end.', { exitCode: EXIT.interrupted }));
  const signals = io.signals ?? process;
  signals.on('SIGINT', onSigint);
  return { signal: controller.signal, dispose: () => signals.off('SIGINT', onSigint) };
}

async function verifyArchive(path: string, opts: VerifyOptions, io: VerifyIo): Promise<void> {
  const campaign: OfflineCampaign | null = opts.campaignSpec === undefined ? null : await readOfflineCampaign(opts.campaignSpec);
  // The format comes from the name, as for the portal: a wrong name is a usage error, whatever the file holds.
  const named = formatOfFileName(basename(path));
  if (!named || !isResultArchiveFormat(named)) {
    throw new CliError(`${basename(path)} is not a result archive: its name must end in .tar.gz, .tgz, .tar or .zip.`, { exitCode: EXIT.usage });
  }
  let source;
  try {
    source = await localFileSource(path, named);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new CliError(`cannot read ${path}: no such file.`, { cause: e });
    if (code === 'EACCES') throw new CliError(`cannot read ${path}: permission denied.`, { cause: e });
    throw new CliError(`cannot verify ${path}: ${(e as Error).message}.`, { exitCode: code ? EXIT.failed : EXIT.usage, cause: e });
  }

  const cancel = cancelOnSigint(io);
  const line = !opts.json && io.stderr.isTTY ? progressLine(io.stderr, basename(path)) : null;
  let result: ArchiveCheckResult;
  try {
    result = await checkArchive(source, { campaign: campaign ? offlineContext(campaign) : undefined, onProgress: line?.draw, signal: cancel.signal });
    line?.clear();
  } catch (e) {
    line?.clear();
    if (cancel.signal.aborted) throw cancel.signal.reason;
    throw e;
  } finally {
    cancel.dispose();
  }
  const problems = offlineProblems(result.problems, campaign);

  // The log is asked by the file's SHA-256; a check that stopped early has none, so it is read here.
  let log: LogReport | null = null;
  let skipped: string | null = null;
  const connection = opts.offline ? null : configuredConnection(opts.profile, io.env);
  if (opts.offline) skipped = 'the provenance log was not asked (--offline)';
  else if (!connection) skipped = 'no portal is signed in (localis login, or LOCALIS_URL and LOCALIS_TOKEN), so the provenance log was not asked';
  else {
    const sha256 = result.sha256 ?? (await sha256OfFile(path));
    log = await archiveInLog(connection, sha256, opts.requireLog, io.env);
  }

  const logFailed = log !== null && log.checks.some((c) => !c.ok);
  if (opts.json) {
    io.out.out(
      JSON.stringify(
        {
          file: path,
          format: source.format,
          sizeBytes: source.sizeBytes,
          sha256: result.sha256,
          entries: result.entries,
          unpackedBytes: result.unpackedBytes,
          manifest: result.manifest,
          tables: result.tables,
          campaignSpec: campaign?.name ?? null,
          problems,
          log: log ? { portal: log.portal, found: log.found, checks: log.checks } : null,
          ok: problems.length === 0 && !logFailed,
        },
        null,
        2,
      ),
    );
  } else {
    io.out.out(formatArchiveReport({ path, format: source.format, result, problems, campaign, log, skipped }));
  }
  if (problems.length || logFailed) throw failure(path, problems, log);
}

function failure(path: string, problems: ArchiveProblem[], log: LogReport | null): CliError {
  const failedChecks = log?.checks.filter((c) => !c.ok) ?? [];
  const lines: string[] = [];
  if (problems.length) lines.push(`${basename(path)} has ${problems.length} ${problems.length === 1 ? 'problem' : 'problems'}:`, ...problems.map(formatProblem));
  if (failedChecks.length) {
    lines.push(`${lines.length ? 'and the' : 'The'} provenance log check failed:`, ...failedChecks.map((c) => `  ${c.name}: ${c.detail}`));
  }
  return new CliError(lines.join('\n'));
}

/** Asks the log for the archive's entry and checks it all the way to a head signed by the pinned key. */
async function archiveInLog(connection: Connection, sha256: string, requireLog: boolean, env: NodeJS.ProcessEnv): Promise<LogReport> {
  const client = new ApiClient(connection);
  const report: LogReport = { portal: connection.url, found: false, checks: [], notes: [] };
  let key: SigningKey;
  try {
    key = await client.get('/provenance/key', SigningKey);
  } catch (e) {
    if (!isCliError(e) || e.exitCode !== EXIT.failed) throw e;
    report.checks.push({ name: 'portal', ok: false, detail: `${e.message} (--offline checks without the portal)` });
    return report;
  }
  const pin = pinKey(connection.url, key, env);
  report.checks.push(keyCheck(pin));
  let found: ProvenanceEntryWithProof | null;
  try {
    found = await client.get(`/provenance/archives/${sha256}`, ProvenanceEntryWithProof);
  } catch (e) {
    if (!isNotFound(e)) throw e;
    found = null;
  }
  if (!found) {
    const text = `no verified archive with this SHA-256 is in the log (not uploaded, not verified yet, or a different file)`;
    if (requireLog) report.checks.push({ name: 'in-log', ok: false, detail: text });
    else report.notes.push(text);
    return report;
  }
  report.found = true;
  report.checks.push(...checkArchiveEntry(sha256, found.entry, found.proof, pin.pinned.publicKeyPem, pin.pinned.keyId));
  return report;
}

function keyCheck(pin: PinOutcome): LogCheck {
  if (pin.status === 'changed') {
    return {
      name: 'signing-key',
      ok: false,
      detail:
        `the portal signs with key ${pin.offered.keyId} now, but key ${pin.pinned.keyId} was pinned on ${pin.pinned.pinnedAt.slice(0, 10)}; ` +
        `heads are checked with the pinned key. If the portal's operators announced a new key, remove this portal's entry from ${pin.path} to pin it`,
    };
  }
  return {
    name: 'signing-key',
    ok: true,
    detail: pin.status === 'new' ? `key ${pin.pinned.keyId} (Ed25519) pinned now, on first use, in ${pin.path}` : `key ${pin.pinned.keyId} is the one pinned on ${pin.pinned.pinnedAt.slice(0, 10)}`,
  };
}

/** `localis verify --log`: the latest head's signature, and that the log only grew since the saved head. */
async function verifyLog(opts: VerifyOptions, io: VerifyIo): Promise<void> {
  if (opts.offline) throw new CliError('--log asks the portal for its log; it cannot be --offline.', { exitCode: EXIT.usage });
  if (opts.campaignSpec !== undefined) throw new CliError('--campaign-spec goes with an archive, not with --log.', { exitCode: EXIT.usage });
  if (opts.requireLog) throw new CliError('--require-log goes with an archive, not with --log.', { exitCode: EXIT.usage });
  const connection = resolveConnection({ profile: opts.profile }, io.env);
  const client = new ApiClient(connection);
  const headPath = opts.head ?? defaultHeadPath(io.env);
  const saved = readSavedHead(headPath, connection.url);

  const key = await client.get('/provenance/key', SigningKey);
  const pin = pinKey(connection.url, key, io.env);
  const latest = await client.get('/provenance/head', SignedTreeHead);
  const report: LogReport = { portal: connection.url, found: true, checks: [keyCheck(pin), checkHeadSignature(pin.pinned.publicKeyPem, pin.pinned.keyId, latest)], notes: [] };

  if (!saved) {
    report.notes.push(`no saved head for this portal in ${headPath} yet: the next run checks that the log only grew since this one`);
  } else if (saved.treeSize === 0 || latest.treeSize < saved.treeSize) {
    report.checks.push(...checkConsistency(saved, latest, null));
  } else {
    // Pinned to the head just checked: the latest head may move on between two requests.
    const query = new URLSearchParams({ from: String(saved.treeSize), to: String(latest.treeSize) });
    let proof: ConsistencyProof | null = null;
    try {
      proof = await client.get(`/provenance/consistency?${query}`, ConsistencyProof);
    } catch (e) {
      if (!isNotFound(e)) throw e;
      report.checks.push({ name: 'consistency', ok: false, detail: `the portal has no signed head of ${saved.treeSize.toLocaleString('en')} entries, the size of the saved head: ${e instanceof Error ? e.message : String(e)}` });
    }
    if (proof) report.checks.push(...checkConsistency(saved, latest, proof));
  }

  const ok = report.checks.every((c) => c.ok);
  // A head that failed a check is not saved: the saved head stays the last one known good.
  if (ok) {
    saveHead(headPath, connection.url, latest, opts.head === undefined);
    report.notes.push(`saved the head of ${latest.treeSize.toLocaleString('en')} entries to ${headPath}`);
  }
  if (opts.json) io.out.out(JSON.stringify({ portal: connection.url, head: latest, saved: saved ?? null, checks: report.checks, ok, headFile: headPath }, null, 2));
  else io.out.out(formatLogReport(report, latest));
  if (!ok) {
    throw new CliError(['the provenance log check failed:', ...report.checks.filter((c) => !c.ok).map((c) => `  ${c.name}: ${c.detail}`)].join('\n'), {
      hint: `The saved head in ${headPath} was kept.`,
    });
  }
}

/** One line on a terminal while a large archive is read, wiped before the report. */
function progressLine(stderr: NodeJS.WriteStream, name: string) {
  let drawn = false;
  return {
    draw(read: number, total: number) {
      if (total < 64 * 1024 * 1024) return;
      const text = `checking ${name}: ${Math.floor((100 * read) / total)} % (${formatSize(read)} of ${formatSize(total)})`;
      stderr.write(`\r${text.slice(0, Math.max(20, (stderr.columns || 80) - 1))}\x1b[K`);
      drawn = true;
    },
    clear() {
      if (drawn) stderr.write('\r\x1b[K');
    },
  };
}
