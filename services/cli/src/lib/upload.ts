import { open, stat } from 'node:fs/promises';
import { ARCHIVE_STATE_LABELS, type Archive } from '@localis/shared';
import { ApiClient } from './api-client';
import { CliError, EXIT, isCliError } from './cli-error';
import { resolveConnection } from './connection';
import { terminalOutput, type Output } from './output';
import { archivesApi, type ArchivesApi } from './upload-api';
import { formatSize, formatStats, formatUploaded, rejectionMessage, uploadStats, type UploadSummary } from './upload-format';
import { sha256OfFile } from './upload-hash';
import { planUpload, type UploadOptions, type UploadPlan } from './upload-options';
import { planParts, type PartLayout } from './upload-parts';
import { progressView, type ProgressView, type UploadCounters } from './upload-progress';
import { sendParts } from './upload-sender';
import { loadUploadState, removeUploadState, saveUploadState, type UploadIdentity } from './upload-state';
import { BandwidthLimit } from './upload-throughput';

/** The store assembles the parts when the upload completes: for a very large archive that takes minutes. */
const COMPLETE_TIMEOUT_MS = 15 * 60 * 1000;
/** How often the progress is redrawn (and the speed sampled). */
const PROGRESS_TICK_MS = 250;

export interface UploadIo {
  out: Output;
  stderr: NodeJS.WriteStream;
  env: NodeJS.ProcessEnv;
  /** Ctrl-C; a test passes its own. */
  signals?: NodeJS.EventEmitter;
  now?: () => number;
  /** Wait before retry n of a failed part (tests shorten it). */
  retryBackoffMs?: (attempt: number) => number;
}

const defaultIo = (): UploadIo => ({ out: terminalOutput, stderr: process.stderr, env: process.env, signals: process });

/** Where an upload starts: a new archive, an unfinished one to go on with, or one already complete. */
type Start =
  | { kind: 'send'; archive: Archive; layout: PartLayout; stored: { partNumber: number; sizeBytes: number }[]; resumed: boolean }
  | { kind: 'complete'; archive: Archive };

/**
 * `localis upload`: the browser's protocol from a login node. The api plans the parts and hands
 * out presigned addresses; the parts go straight to the object store, `parallel` at a time, each
 * read from the file into its own buffer (memory does not grow with the file). The SHA-256 of the
 * whole file is computed on the way; completing hands it to the api, and the worker checks the
 * archive against it. An interrupted upload is remembered (upload-state.ts): the same command
 * again sends only the parts the store does not hold.
 */
export async function upload(archivePath: string, opts: UploadOptions, io: UploadIo = defaultIo()): Promise<void> {
  const plan = await planUpload(archivePath, opts);
  const connection = resolveConnection({ profile: opts.profile }, io.env);
  const api = archivesApi(new ApiClient(connection), new ApiClient({ ...connection, timeoutMs: COMPLETE_TIMEOUT_MS }));
  const identity: UploadIdentity = { portal: connection.url, campaignId: plan.campaignId, kind: plan.kind, path: plan.path, sizeBytes: plan.sizeBytes, mtimeMs: plan.mtimeMs };
  const view = progressView(io.stderr, io.now);

  const interrupt = new AbortController();
  let interrupts = 0;
  const onSigint = () => {
    // A second Ctrl-C does not wait for in-flight parts to stop.
    if (++interrupts > 1) process.exit(EXIT.interrupted);
    interrupt.abort(new CliError('interrupted.', { exitCode: EXIT.interrupted }));
  };
  const signals = io.signals ?? process;
  signals.on('SIGINT', onSigint);
  try {
    const start = await startOrResume(api, plan, identity, view, io.env);
    let archive: Archive;
    let sha256: string;
    let summary: UploadSummary | null = null;
    if (start.kind === 'complete') {
      archive = start.archive;
      sha256 = archive.declaredSha256 ?? '';
    } else {
      const sent = await sendFile(api, plan, start, view, interrupt.signal, io.now ?? Date.now, io.retryBackoffMs);
      summary = sent.summary;
      sha256 = sent.sha256;
      archive = await complete(api, plan, start, sha256, view, interrupt.signal);
      removeUploadState(identity, io.env);
    }

    if (plan.wait && (archive.state === 'received' || archive.state === 'checking')) {
      archive = await waitForCheck(api, archive, view, interrupt.signal);
    }
    const stats = plan.stats ? uploadStats(summary ?? { partCount: 0, partsAlreadyStored: 0, alreadyStoredBytes: 0, partsSent: 0, sentBytes: 0, resumed: true, seconds: 0 }) : undefined;
    if (plan.json) io.out.out(JSON.stringify({ archive, sha256, upload: summary, ...(stats ? { stats } : {}) }, null, 2));
    else {
      if (archive.state !== 'rejected') io.out.out(formatUploaded(archive, sha256, summary));
      if (stats) view.note(formatStats(stats));
    }
    if (archive.state === 'rejected') {
      throw new CliError(rejectionMessage(archive), { hint: 'Fix the archive (`localis verify <archive>` runs the same checks here) and upload it again.' });
    }
  } catch (e) {
    if (interrupt.signal.aborted && isCliError(e) && e === interrupt.signal.reason) throw interruptedError(e, identity, io.env);
    throw e;
  } finally {
    signals.off('SIGINT', onSigint);
    view.stop();
  }
}

/** What Ctrl-C leaves behind, in words: the upload is remembered, or it is complete and being checked. */
function interruptedError(reason: CliError, identity: UploadIdentity, env: NodeJS.ProcessEnv): CliError {
  if (reason.message !== 'interrupted.') return reason;
  const remembered = loadUploadState(identity, env);
  if (remembered) {
    return new CliError(`interrupted; the parts sent so far are kept (archive ${remembered.archiveId}).`, {
      exitCode: EXIT.interrupted,
      hint: 'Run the same command again to send the rest.',
    });
  }
  return new CliError('interrupted.', { exitCode: EXIT.interrupted });
}

/** A new archive, or the one an earlier attempt started for this very file. */
async function startOrResume(api: ArchivesApi, plan: UploadPlan, identity: UploadIdentity, view: ProgressView, env: NodeJS.ProcessEnv): Promise<Start> {
  const remembered = loadUploadState(identity, env);
  if (remembered) {
    const archive = await api.find(remembered.archiveId);
    if (!archive) {
      view.note(`the unfinished upload of ${plan.fileName} (archive ${remembered.archiveId}) is not known to the portal any more; starting anew.`);
    } else if (archive.sizeBytes !== plan.sizeBytes || archive.campaignId !== plan.campaignId) {
      view.note(`archive ${archive.id} is not an upload of this file; starting anew.`);
    } else if (archive.state === 'rejected' && archive.declaredSha256 === null) {
      // Never completed: the upload was cancelled, or abandoned by the portal after too long.
      const reason = archive.problems[0]?.message ?? 'it ended without being completed';
      view.note(`the unfinished upload of ${plan.fileName} (archive ${archive.id}) ended on the portal (${reason}); starting anew.`);
    } else if (archive.state !== 'uploading') {
      removeUploadState(identity, env);
      view.note(`${plan.fileName} was uploaded completely already (archive ${archive.id}, ${ARCHIVE_STATE_LABELS[archive.state].toLowerCase()}).`);
      return { kind: 'complete', archive };
    } else {
      const layout = { sizeBytes: archive.sizeBytes, partSizeBytes: archive.partSizeBytes, partCount: archive.partCount };
      const stored = await api.storedParts(archive.id);
      const { storedCount, storedBytes } = planParts(layout, stored);
      view.note(
        `going on with archive ${archive.id}: ${storedCount} of ${archive.partCount} parts (${formatSize(storedBytes)}) are stored already; ` +
          `sending the other ${archive.partCount - storedCount}.`,
      );
      return { kind: 'send', archive, layout, stored, resumed: true };
    }
  }
  const created = await api.create(plan.campaignId, { kind: plan.kind, fileName: plan.fileName, sizeBytes: plan.sizeBytes, ...(plan.runIds.length ? { runIds: plan.runIds } : {}) });
  try {
    saveUploadState(identity, created.archive.id, env);
  } catch (e) {
    view.note(`warning: cannot remember this upload for a resume (${(e as Error).message}); an interrupted upload would start again from the beginning.`);
  }
  view.note(
    `uploading ${plan.fileName} (${formatSize(plan.sizeBytes)}, ${created.partCount} ${created.partCount === 1 ? 'part' : 'parts'} of ${formatSize(created.partSizeBytes)}) as archive ${created.archive.id}.`,
  );
  return { kind: 'send', archive: created.archive, layout: { sizeBytes: plan.sizeBytes, partSizeBytes: created.partSizeBytes, partCount: created.partCount }, stored: [], resumed: false };
}

/** Sends the missing parts and reads the whole file into the SHA-256, side by side. */
async function sendFile(
  api: ArchivesApi,
  plan: UploadPlan,
  start: Extract<Start, { kind: 'send' }>,
  view: ProgressView,
  signal: AbortSignal,
  now: () => number,
  backoff?: (attempt: number) => number,
): Promise<{ sha256: string; summary: UploadSummary }> {
  const parts = planParts(start.layout, start.stored);
  const counters: UploadCounters = { totalBytes: plan.sizeBytes, storedBytes: parts.storedBytes, inFlightBytes: 0, hashedBytes: 0 };
  let partsSent = 0;
  let sentBytes = 0;
  // Either side failing stops the other: no checksum is needed for an upload that cannot complete.
  const failed = new AbortController();
  const both = AbortSignal.any([signal, failed.signal]);
  const stopOnFailure = <T>(promise: Promise<T>) =>
    promise.catch((e: unknown) => {
      failed.abort(e);
      throw e;
    });

  const file = await open(plan.path, 'r');
  const startedAt = now();
  view.update(counters);
  const tick = setInterval(() => view.update(counters), PROGRESS_TICK_MS);
  let sha256: string;
  try {
    [sha256] = await Promise.all([
      stopOnFailure(sha256OfFile(plan.path, { signal: both, onBytes: (n) => (counters.hashedBytes = n) })),
      stopOnFailure(
        sendParts({
          file,
          layout: start.layout,
          queue: parts.queue,
          askForUrls: (numbers) => api.partUrls(start.archive.id, numbers),
          parallel: plan.parallel,
          signal: both,
          limit: plan.limitBytesPerSecond ? new BandwidthLimit(plan.limitBytesPerSecond) : undefined,
          onInFlightBytes: (bytes) => (counters.inFlightBytes = bytes),
          onPartStored: (_part, bytes) => {
            counters.storedBytes += bytes;
            partsSent += 1;
            sentBytes += bytes;
          },
          backoff,
          onRetry: (part, attempt, reason, waitMs) => view.note(`part ${part}: ${reason}; trying again in ${Math.round(waitMs / 1000)} s (retry ${attempt}).`),
        }),
      ),
    ]);
  } catch (e) {
    // The first reason wins: Ctrl-C, or the side that failed first (not the other side's abort).
    if (signal.aborted) throw signal.reason;
    throw failed.signal.aborted ? failed.signal.reason : e;
  } finally {
    clearInterval(tick);
    view.update(counters);
    view.stop();
    await file.close();
  }

  // A file that changed while it was read would be checked against a checksum of neither version.
  const after = await stat(plan.path);
  if (after.size !== plan.sizeBytes || Math.trunc(after.mtimeMs) !== Math.trunc(plan.mtimeMs)) {
    throw new CliError(`${plan.fileName} changed while it was being uploaded; the upload was not completed.`, {
      hint: 'Upload it again once it is written completely; the changed file starts a new upload.',
    });
  }
  const seconds = (now() - startedAt) / 1000;
  return {
    sha256,
    summary: { partCount: start.layout.partCount, partsAlreadyStored: parts.storedCount, alreadyStoredBytes: parts.storedBytes, partsSent, sentBytes, resumed: start.resumed, seconds },
  };
}

/**
 * Completes the upload. Should the store miss a part after all (a part lost after it was
 * acknowledged), the missing parts are sent again and completing is tried once more.
 */
async function complete(api: ArchivesApi, plan: UploadPlan, start: Extract<Start, { kind: 'send' }>, sha256: string, view: ProgressView, signal: AbortSignal): Promise<Archive> {
  const id = start.archive.id;
  try {
    return await api.complete(id, sha256);
  } catch (e) {
    if (!isCliError(e) || e.exitCode !== EXIT.failed) throw e;
    const now = await api.find(id).catch(() => null);
    // The completion went through after all (its answer was lost).
    if (now && now.state !== 'uploading' && now.declaredSha256 === sha256) return now;
    if (!now || now.state !== 'uploading') throw e;
    const missing = planParts(start.layout, await api.storedParts(id)).queue;
    // All missing would mean the store forgot the upload itself: sending again cannot help.
    if (missing.length === 0 || missing.length === start.layout.partCount) throw e;
    view.note(`the store is missing ${missing.length} ${missing.length === 1 ? 'part' : 'parts'} (${missing.slice(0, 10).join(', ')}); sending ${missing.length === 1 ? 'it' : 'them'} again.`);
    const file = await open(plan.path, 'r');
    try {
      await sendParts({ file, layout: start.layout, queue: missing, askForUrls: (numbers) => api.partUrls(id, numbers), parallel: plan.parallel, signal });
    } finally {
      await file.close();
    }
    return api.complete(id, sha256);
  }
}

const sleep = (ms: number, signal: AbortSignal) =>
  new Promise<void>((resolve, reject) => {
    if (signal.aborted) return reject(signal.reason);
    const timer = setTimeout(resolve, ms);
    signal.addEventListener(
      'abort',
      () => {
        clearTimeout(timer);
        reject(signal.reason);
      },
      { once: true },
    );
  });

/** Polls the archive until the worker has checked it, saying each change of state. */
async function waitForCheck(api: ArchivesApi, first: Archive, view: ProgressView, signal: AbortSignal): Promise<Archive> {
  let archive = first;
  const startedAt = Date.now();
  const say = (a: Archive) => view.note(`${a.fileName}: ${ARCHIVE_STATE_LABELS[a.state].toLowerCase()}${a.state === 'checking' || a.state === 'received' ? '…' : '.'}`);
  say(archive);
  let failures = 0;
  let toldSlow = false;
  try {
    while (archive.state === 'received' || archive.state === 'checking' || archive.state === 'uploading') {
      const elapsed = Date.now() - startedAt;
      await sleep(elapsed < 30_000 ? 1000 : elapsed < 120_000 ? 2000 : 5000, signal);
      let next: Archive;
      try {
        next = await api.get(archive.id);
        failures = 0;
      } catch (e) {
        // The upload is done; a blip while waiting for the check is no reason to fail.
        if (!isCliError(e) || e.exitCode !== EXIT.failed || ++failures > 5) throw e;
        view.note(`could not ask for the archive's state (${e.message}); asking again.`);
        continue;
      }
      if (next.state !== archive.state) say(next);
      archive = next;
      if (!toldSlow && Date.now() - startedAt > 60_000 && archive.state === 'received') {
        toldSlow = true;
        view.note("the check has not started after a minute (the portal's worker may be busy); still waiting. Ctrl-C stops waiting, not the check.");
      }
    }
  } catch (e) {
    if (signal.aborted) {
      throw new CliError(`stopped waiting; ${archive.fileName} is uploaded (archive ${archive.id}) and the portal checks it without you.`, {
        exitCode: EXIT.interrupted,
        hint: "Its state is on the campaign's page in the portal.",
      });
    }
    throw e;
  }
  return archive;
}
