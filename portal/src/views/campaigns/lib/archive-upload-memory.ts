import type { ArchiveKind } from '@localis/shared';

/**
 * Uploads this browser started and has not finished, remembered across reloads: when the person
 * picks the same file again (same name, size and modification time), the upload can go on from
 * the parts the store holds instead of starting over.
 */
export interface RememberedUpload {
  archiveId: string;
  campaignId: string;
  kind: ArchiveKind;
  fileName: string;
  sizeBytes: number;
  lastModified: number;
  startedAt: string;
}

/** What identifies a picked file well enough without reading it. */
export interface FileIdentity {
  name: string;
  size: number;
  lastModified?: number;
}

const KEY = 'localis:archive-uploads';
/** Old entries beyond this many are dropped: the store has long cleared such uploads anyway. */
const KEEP = 20;

function defaultStorage(): Storage | null {
  try {
    return globalThis.localStorage ?? null;
  } catch {
    // Storage can be switched off; uploads then simply cannot be resumed after a reload.
    return null;
  }
}

function isRemembered(value: unknown): value is RememberedUpload {
  const v = value as Partial<RememberedUpload> | null;
  return !!v && typeof v.archiveId === 'string' && typeof v.campaignId === 'string' && typeof v.fileName === 'string' && typeof v.sizeBytes === 'number' && typeof v.lastModified === 'number';
}

export function rememberedUploads(storage: Storage | null = defaultStorage()): RememberedUpload[] {
  try {
    const parsed: unknown = JSON.parse(storage?.getItem(KEY) ?? '[]');
    return Array.isArray(parsed) ? parsed.filter(isRemembered) : [];
  } catch {
    return [];
  }
}

function save(entries: RememberedUpload[], storage: Storage | null): void {
  try {
    if (entries.length) storage?.setItem(KEY, JSON.stringify(entries.slice(-KEEP)));
    else storage?.removeItem(KEY);
  } catch {
    // Full or switched off: the upload still works, it just cannot be resumed after a reload.
  }
}

export function rememberUpload(entry: RememberedUpload, storage: Storage | null = defaultStorage()): void {
  save([...rememberedUploads(storage).filter((e) => e.archiveId !== entry.archiveId), entry], storage);
}

export function forgetUpload(archiveId: string, storage: Storage | null = defaultStorage()): void {
  const entries = rememberedUploads(storage);
  if (entries.some((e) => e.archiveId === archiveId)) save(entries.filter((e) => e.archiveId !== archiveId), storage);
}

/** The unfinished upload of this very file to this campaign, if this browser remembers one. */
export function findRememberedUpload(campaignId: string, file: FileIdentity, storage: Storage | null = defaultStorage()): RememberedUpload | null {
  const matches = rememberedUploads(storage).filter(
    (e) => e.campaignId === campaignId && e.fileName === file.name && e.sizeBytes === file.size && e.lastModified === (file.lastModified ?? 0),
  );
  return matches[matches.length - 1] ?? null;
}
