import { CliError, EXIT } from './cli-error';
import { checkProfileName, DEFAULT_PROFILE, loadProfile } from './credentials';

/** Where `npm start` serves the portal; a stored profile or LOCALIS_URL points elsewhere. */
export const DEFAULT_URL = 'http://127.0.0.1:4100';

/** Which portal and token a command uses, and where each came from, so whoami can say so. */
export interface Connection {
  url: string;
  token: string;
  profile: string;
  urlFrom: 'option' | 'LOCALIS_URL' | 'profile' | 'default';
  tokenFrom: 'LOCALIS_TOKEN' | 'profile';
}

/**
 * The portal address as typed, reduced to its base: people paste the address bar (`…/profile`
 * is not stripped, it could be a path prefix) or the API root (`…/api/v1` is).
 */
export function normaliseUrl(input: string): string {
  let url: URL;
  try {
    url = new URL(input.trim());
  } catch {
    throw new CliError(`"${input}" is not a URL; give the portal address, e.g. https://localis.example.org`, { exitCode: EXIT.usage });
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:') {
    throw new CliError(`"${input}" is not an http:// or https:// address.`, { exitCode: EXIT.usage });
  }
  if (url.username || url.password) {
    throw new CliError('Put no user name or password in the URL; the API token is what signs you in.', { exitCode: EXIT.usage });
  }
  const path = url.pathname.replace(/\/+$/, '').replace(/\/api\/v1$/, '');
  return `${url.origin}${path}`;
}

/** The portal of a profile without requiring a token: what `login` starts from. */
export function resolveUrl(opts: { profile: string; url?: string }, env: NodeJS.ProcessEnv = process.env): Pick<Connection, 'url' | 'urlFrom'> {
  if (opts.url) return { url: normaliseUrl(opts.url), urlFrom: 'option' };
  if (env.LOCALIS_URL) return { url: normaliseUrl(env.LOCALIS_URL), urlFrom: 'LOCALIS_URL' };
  const stored = loadProfile(opts.profile, env);
  if (stored) return { url: normaliseUrl(stored.url), urlFrom: 'profile' };
  return { url: DEFAULT_URL, urlFrom: 'default' };
}

/**
 * LOCALIS_URL and LOCALIS_TOKEN win over the stored profile, so a batch job can carry its own
 * token without anyone running `localis login` on the compute node.
 */
export function resolveConnection(opts: { profile: string }, env: NodeJS.ProcessEnv = process.env): Connection {
  const profile = checkProfileName(opts.profile);
  const { url, urlFrom } = resolveUrl({ profile }, env);
  const envToken = env.LOCALIS_TOKEN?.trim();
  if (envToken) return { url, token: envToken, profile, urlFrom, tokenFrom: 'LOCALIS_TOKEN' };
  const stored = loadProfile(profile, env);
  if (stored) return { url, token: stored.token, profile, urlFrom, tokenFrom: 'profile' };
  const flag = profile === DEFAULT_PROFILE ? '' : ` --profile ${profile}`;
  throw new CliError(`you are not signed in${profile === DEFAULT_PROFILE ? '' : ` for profile "${profile}"`}.`, {
    exitCode: EXIT.notSignedIn,
    hint: `Run \`localis login${flag}\`, or set LOCALIS_TOKEN (and LOCALIS_URL) in a batch script.`,
  });
}
