import { createHash } from 'node:crypto';
import { chmodSync, mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import { configDir } from './credentials';

/**
 * Unfinished uploads, remembered so that running the same `localis upload` again (after Ctrl-C, a
 * dropped connection, a killed batch job) goes on with the same archive and sends only the parts
 * the store does not hold yet. One small file per upload under `<config dir>/uploads/`, so that
 * several uploads running at once never write the same file.
 */

/** What identifies "the same upload": the same file, unchanged, to the same campaign on the same portal. */
export interface UploadIdentity {
  /** The portal's base address (the same campaign id may exist on a test and a production portal). */
  portal: string;
  campaignId: string;
  kind: string;
  /** Absolute path of the file. */
  path: string;
  sizeBytes: number;
  /** Modification time in ms: a file rewritten in place is a new upload, even at the same size. */
  mtimeMs: number;
}

export const UploadState = z.object({
  archiveId: z.uuid(),
  portal: z.string(),
  campaignId: z.string(),
  kind: z.string(),
  path: z.string(),
  sizeBytes: z.number().int(),
  mtimeMs: z.number(),
  startedAt: z.string(),
});
export type UploadState = z.infer<typeof UploadState>;

const UPLOADS_DIR = 'uploads';

/** The name the upload is remembered under: a hash of its identity, so any path fits a file name. */
export function uploadKey(id: UploadIdentity): string {
  const text = JSON.stringify([id.portal, id.campaignId.toLowerCase(), id.kind, id.path, id.sizeBytes, Math.trunc(id.mtimeMs)]);
  return createHash('sha256').update(text).digest('hex').slice(0, 32);
}

export function uploadStatePath(id: UploadIdentity, env: NodeJS.ProcessEnv = process.env): string {
  return join(configDir(env), UPLOADS_DIR, `${uploadKey(id)}.json`);
}

/** The archive an earlier attempt started for this very file, or null (none, or a file we cannot use). */
export function loadUploadState(id: UploadIdentity, env: NodeJS.ProcessEnv = process.env): UploadState | null {
  let text: string;
  try {
    text = readFileSync(uploadStatePath(id, env), 'utf8');
  } catch {
    return null;
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    return null;
  }
  const parsed = UploadState.safeParse(json);
  if (!parsed.success) return null;
  const s = parsed.data;
  // The key is a hash: check that the file really is about this upload.
  const same = s.portal === id.portal && s.campaignId === id.campaignId.toLowerCase() && s.kind === id.kind && s.path === id.path && s.sizeBytes === id.sizeBytes && Math.trunc(s.mtimeMs) === Math.trunc(id.mtimeMs);
  return same ? s : null;
}

/** Remember the archive of this upload; returns the path written. Written beside and renamed, so never half a file. */
export function saveUploadState(id: UploadIdentity, archiveId: string, env: NodeJS.ProcessEnv = process.env, now: Date = new Date()): string {
  const path = uploadStatePath(id, env);
  const dir = join(configDir(env), UPLOADS_DIR);
  // The config folder holds the tokens: it stays closed to others, as credentials.ts keeps it.
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  chmodSync(configDir(env), 0o700);
  const state: UploadState = {
    archiveId,
    portal: id.portal,
    campaignId: id.campaignId.toLowerCase(),
    kind: id.kind,
    path: id.path,
    sizeBytes: id.sizeBytes,
    mtimeMs: Math.trunc(id.mtimeMs),
    startedAt: now.toISOString(),
  };
  const temporary = `${path}.${process.pid}.tmp`;
  writeFileSync(temporary, `${JSON.stringify(state, null, 2)}\n`, { mode: 0o600 });
  try {
    renameSync(temporary, path);
  } catch (e) {
    rmSync(temporary, { force: true });
    throw e;
  }
  return path;
}

/** Forget the upload once it is complete (or known to be gone). */
export function removeUploadState(id: UploadIdentity, env: NodeJS.ProcessEnv = process.env): void {
  rmSync(uploadStatePath(id, env), { force: true });
}
