import { chmodSync, mkdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { homedir } from 'node:os';
import { join } from 'node:path';
import { z } from 'zod';
import { detailsFromZod } from '@localis/shared';
import { CliError, EXIT } from './cli-error';

export const DEFAULT_PROFILE = 'default';
const FILE_NAME = 'credentials.json';

/** Profile names become JSON keys and appear in messages; keep them plain words. */
const ProfileName = z
  .string()
  .regex(/^[A-Za-z0-9][A-Za-z0-9_.-]{0,63}$/, 'use letters, digits, ".", "_" or "-" (at most 64), starting with a letter or digit');

export const StoredProfile = z.object({ url: z.string(), token: z.string() });
export type StoredProfile = z.infer<typeof StoredProfile>;

const CredentialsFile = z.object({ profiles: z.record(z.string(), StoredProfile) });
type CredentialsFile = z.infer<typeof CredentialsFile>;

export function checkProfileName(name: string): string {
  const parsed = ProfileName.safeParse(name);
  if (!parsed.success) {
    throw new CliError(`"${name}" cannot be a profile name: ${parsed.error.issues[0].message}.`, { exitCode: EXIT.usage });
  }
  return parsed.data;
}

/** `$LOCALIS_CONFIG_DIR`, else the XDG place (`~/.config/localis`), which is what cluster homes expect. */
export function configDir(env: NodeJS.ProcessEnv = process.env): string {
  if (env.LOCALIS_CONFIG_DIR) return env.LOCALIS_CONFIG_DIR;
  return join(env.XDG_CONFIG_HOME || join(env.HOME || homedir(), '.config'), 'localis');
}

export function credentialsPath(env: NodeJS.ProcessEnv = process.env): string {
  return join(configDir(env), FILE_NAME);
}

export function readCredentials(env: NodeJS.ProcessEnv = process.env): CredentialsFile {
  const path = credentialsPath(env);
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return { profiles: {} };
    throw new CliError(`cannot read ${path}: ${(e as Error).message}`, { cause: e });
  }
  tightenIfLoose(path);
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new CliError(`${path} is not valid JSON.`, { hint: 'Fix it by hand, or delete it and run `localis login` again.', cause: e });
  }
  const parsed = CredentialsFile.safeParse(json);
  if (!parsed.success) {
    throw new CliError(`${path} is not a Localis credentials file.`, {
      details: detailsFromZod(parsed.error),
      hint: 'Fix it by hand, or delete it and run `localis login` again.',
    });
  }
  return parsed.data;
}

export function loadProfile(name: string, env: NodeJS.ProcessEnv = process.env): StoredProfile | undefined {
  return readCredentials(env).profiles[checkProfileName(name)];
}

/** Store (or replace) one profile, keeping the others. Returns the path written. */
export function saveProfile(name: string, profile: StoredProfile, env: NodeJS.ProcessEnv = process.env): string {
  const file = readCredentials(env);
  file.profiles[checkProfileName(name)] = StoredProfile.parse(profile);
  return writeCredentials(file, env);
}

/** Forget one profile. Returns what was stored, or undefined when there was nothing. */
export function removeProfile(name: string, env: NodeJS.ProcessEnv = process.env): StoredProfile | undefined {
  const file = readCredentials(env);
  const key = checkProfileName(name);
  const removed = file.profiles[key];
  if (!removed) return undefined;
  delete file.profiles[key];
  writeCredentials(file, env);
  return removed;
}

function writeCredentials(file: CredentialsFile, env: NodeJS.ProcessEnv): string {
  const dir = configDir(env);
  const path = credentialsPath(env);
  try {
    // Home directories on clusters are often readable by the whole project group: the directory
    // and the file are closed to everyone but the owner, whatever the umask says.
    mkdirSync(dir, { recursive: true, mode: 0o700 });
    chmodSync(dir, 0o700);
    // Written beside and renamed, so an interrupted write (quota, Ctrl-C) never leaves half a
    // file, and the secret never sits in a file with wider permissions, not even for a moment.
    const temporary = `${path}.${process.pid}.tmp`;
    writeFileSync(temporary, `${JSON.stringify(file, null, 2)}\n`, { mode: 0o600 });
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
  return path;
}

/** A copied or restored file may be readable by others; close it and say so, since the token may have leaked. */
function tightenIfLoose(path: string): void {
  const mode = statSync(path).mode & 0o777;
  if ((mode & 0o077) === 0) return;
  chmodSync(path, 0o600);
  process.stderr.write(
    `localis: warning: ${path} was readable by others (mode ${mode.toString(8).padStart(4, '0')}); it is now 0600. ` +
      'If others could read it, revoke its tokens on your profile page.\n',
  );
}
