import { chmodSync, mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { z } from 'zod';
import { SignedTreeHead, type SigningKey } from '@localis/shared';
import { CliError } from './cli-error';
import { configDir } from './credentials';

/**
 * What `localis verify` remembers between runs, per portal: the key that signs the log's tree
 * heads, pinned on first use (a changed key is reported, never taken silently: a portal that
 * could swap its key could sign any history), and the last tree head checked, so the next run can
 * ask for a proof that the log only grew since.
 */

export const KEY_FILE = 'provenance-key.json';
export const HEAD_FILE = 'provenance-head.json';

const PinnedKey = z.object({ keyId: z.string(), algorithm: z.string(), publicKeyPem: z.string(), pinnedAt: z.string() });
export type PinnedKey = z.infer<typeof PinnedKey>;
const KeyFile = z.object({ keys: z.record(z.string(), PinnedKey) });
const HeadFile = z.object({ heads: z.record(z.string(), SignedTreeHead) });

export const keyFilePath = (env: NodeJS.ProcessEnv = process.env) => join(configDir(env), KEY_FILE);
export const defaultHeadPath = (env: NodeJS.ProcessEnv = process.env) => join(configDir(env), HEAD_FILE);

function readJson(path: string): unknown {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
    throw new CliError(`cannot read ${path}: ${(e as Error).message}`, { cause: e });
  }
  try {
    return JSON.parse(text);
  } catch (e) {
    throw new CliError(`${path} is not valid JSON.`, { cause: e, hint: 'Fix it by hand, or delete it (what it held is then trusted anew on the next run).' });
  }
}

/** Written beside and renamed, so an interrupted write never leaves half a file. */
function writeJson(path: string, value: unknown): void {
  try {
    mkdirSync(dirname(path), { recursive: true, mode: 0o700 });
    const temporary = `${path}.${process.pid}.tmp`;
    writeFileSync(temporary, `${JSON.stringify(value, null, 2)}\n`, { mode: 0o600 });
    chmodSync(temporary, 0o600);
    try {
      renameSync(temporary, path);
    } catch (e) {
      rmSync(temporary, { force: true });
      throw e;
    }
  } catch (e) {
    throw new CliError(`cannot write ${path}: ${(e as Error).message}`, { cause: e });
  }
}

export type PinOutcome = { status: 'new' | 'same'; pinned: PinnedKey; path: string } | { status: 'changed'; pinned: PinnedKey; offered: SigningKey; path: string };

/**
 * The portal's key against the one pinned for it. The first key seen is pinned; the same key
 * again is fine; another key is reported as changed and the pinned one stays in force.
 */
export function pinKey(portal: string, offered: SigningKey, env: NodeJS.ProcessEnv = process.env, now: Date = new Date()): PinOutcome {
  const path = keyFilePath(env);
  const raw = readJson(path);
  let file: z.infer<typeof KeyFile> = { keys: {} };
  if (raw !== undefined) {
    const parsed = KeyFile.safeParse(raw);
    if (!parsed.success) throw new CliError(`${path} is not a file of pinned provenance keys.`, { hint: 'Fix it by hand, or delete it to pin the keys anew.' });
    file = parsed.data;
  }
  const pinned = file.keys[portal];
  if (pinned) {
    if (pinned.publicKeyPem.trim() === offered.publicKeyPem.trim() && pinned.keyId === offered.keyId) return { status: 'same', pinned, path };
    return { status: 'changed', pinned, offered, path };
  }
  const fresh: PinnedKey = { keyId: offered.keyId, algorithm: offered.algorithm, publicKeyPem: offered.publicKeyPem, pinnedAt: now.toISOString() };
  file.keys[portal] = fresh;
  writeJson(path, file);
  return { status: 'new', pinned: fresh, path };
}

/**
 * The head saved for this portal: from the default file (heads of several portals, by address),
 * or from a `--head` file holding one head as `GET /api/v1/provenance/head` answers it.
 */
export function readSavedHead(path: string, portal: string): SignedTreeHead | null {
  const raw = readJson(path);
  if (raw === undefined) return null;
  if (typeof raw === 'object' && raw !== null && 'heads' in raw) {
    const parsed = HeadFile.safeParse(raw);
    if (!parsed.success) throw new CliError(`${path} is not a file of saved tree heads.`, { hint: 'Fix it by hand, or delete it to start anew.' });
    return parsed.data.heads[portal] ?? null;
  }
  const head = SignedTreeHead.safeParse(raw);
  if (!head.success) throw new CliError(`${path} is not a signed tree head (as GET /api/v1/provenance/head answers it).`);
  return head.data;
}

/** Saves the head: into the per-portal file when that is the format of `path` (or it is new and `perPortal`), else as one head. */
export function saveHead(path: string, portal: string, head: SignedTreeHead, perPortal: boolean): void {
  const raw = readJson(path);
  const isMap = raw !== undefined ? typeof raw === 'object' && raw !== null && 'heads' in raw : perPortal;
  const plain = { treeSize: head.treeSize, rootHash: head.rootHash, timestamp: head.timestamp, keyId: head.keyId, signature: head.signature };
  if (!isMap) return writeJson(path, plain);
  const file = raw === undefined ? { heads: {} } : HeadFile.parse(raw);
  file.heads[portal] = plain;
  writeJson(path, file);
}
