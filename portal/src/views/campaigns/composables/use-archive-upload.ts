import type { Archive, ArchiveKind } from '@localis/shared';
import { computed, markRaw, reactive, shallowReactive, type Ref } from 'vue';
import { ArchiveUploader, type UploadFile, type UploadProgress } from '../lib/archive-upload';

/** One upload running from this tab: its file, what it is, how far it got and, once done, the archive. */
export interface UploadSession {
  campaignId: string;
  file: UploadFile;
  kind: ArchiveKind;
  runIds: string[];
  progress: UploadProgress;
  uploader: ArchiveUploader;
  archive: Archive | null;
  /** Stopped by the person, not by a failure: there is nothing to try again. */
  cancelled: boolean;
}

/**
 * Uploads live outside the page, one per campaign, so the person can look at other pages of
 * Localis while a large archive goes up and find its progress on coming back. Closing or
 * reloading the tab stops them; the browser asks first, and the archives page then offers to go
 * on from the parts already stored.
 */
const sessions = shallowReactive(new Map<string, UploadSession>());

const RUNNING: readonly UploadProgress['state'][] = ['preparing', 'uploading', 'paused', 'completing'];
const isRunning = (s: UploadSession) => RUNNING.includes(s.progress.state);

function onBeforeUnload(event: BeforeUnloadEvent): void {
  event.preventDefault();
}

function guardUnload(): void {
  if ([...sessions.values()].some(isRunning)) window.addEventListener('beforeunload', onBeforeUnload);
  else window.removeEventListener('beforeunload', onBeforeUnload);
}

function run(session: UploadSession, resumeArchiveId?: string): void {
  const uploader = new ArchiveUploader({
    file: session.file,
    campaignId: session.campaignId,
    kind: session.kind,
    runIds: session.runIds,
    resumeArchiveId,
    onProgress: (progress) => {
      session.progress = progress;
      guardUnload();
    },
  });
  session.uploader = markRaw(uploader);
  session.progress = uploader.progress;
  uploader.start().then(
    (archive) => {
      session.archive = archive;
    },
    () => undefined, // The progress says what went wrong, and the page shows it.
  );
  guardUnload();
}

/**
 * Stops sending for every upload of this tab but keeps them remembered (signing out): the person
 * resumes them after signing in again by choosing the same files.
 */
export function pauseAllUploads(): void {
  for (const session of sessions.values()) session.uploader.pause();
  sessions.clear();
  guardUnload();
}

/** Stops every upload of this tab (tests; leaving the app). */
export function cancelAllUploads(): void {
  for (const session of sessions.values()) session.uploader.cancel();
  sessions.clear();
  guardUnload();
}

export function useArchiveUpload(campaignId: Ref<string>) {
  const session = computed(() => sessions.get(campaignId.value) ?? null);

  function start(file: UploadFile, kind: ArchiveKind, runIds: string[], resumeArchiveId?: string): void {
    if (session.value && isRunning(session.value)) return;
    const fresh = reactive({
      campaignId: campaignId.value,
      file: markRaw(file),
      kind,
      runIds,
      archive: null,
      cancelled: false,
    }) as unknown as UploadSession;
    sessions.set(campaignId.value, fresh);
    run(fresh, resumeArchiveId);
  }

  function cancel(): void {
    const s = session.value;
    if (!s) return;
    s.cancelled = true;
    s.uploader.cancel();
    sessions.delete(s.campaignId);
    guardUnload();
  }

  /** After a failure: goes on with the same upload, sending only what the store lacks. */
  function retry(): void {
    const s = session.value;
    if (!s || isRunning(s)) return;
    run(s, s.uploader.archiveId ?? undefined);
  }

  /** Puts a finished or failed upload away, for the next file. */
  function dismiss(): void {
    const s = session.value;
    if (s && !isRunning(s)) sessions.delete(s.campaignId);
  }

  return {
    session,
    running: computed(() => !!session.value && isRunning(session.value)),
    start,
    pause: () => session.value?.uploader.pause(),
    resume: () => session.value?.uploader.resume(),
    cancel,
    retry,
    dismiss,
  };
}
