import { Profile } from '@localis/shared';
import { ApiClient } from './api-client';
import { CliError, EXIT, isCliError } from './cli-error';
import { normaliseUrl, resolveUrl } from './connection';
import { checkProfileName, saveProfile } from './credentials';
import { maskToken } from './mask-token';
import { terminalOutput, type Output } from './output';
import { obtainToken, type TokenSource } from './token-input';

export interface LoginOptions {
  url?: string;
  token?: string;
  profile: string;
}

const LOOPBACK = new Set(['localhost', '127.0.0.1', '[::1]']);

/** Checks the token against the portal before storing it, so a typo fails now and not in tonight's batch job. */
export async function login(opts: LoginOptions, io: Output = terminalOutput, env: NodeJS.ProcessEnv = process.env, source?: TokenSource): Promise<void> {
  const profile = checkProfileName(opts.profile);
  const { url } = resolveUrl({ profile, url: opts.url }, env);
  const address = new URL(url);
  if (address.protocol === 'http:' && !LOOPBACK.has(address.hostname) && !address.hostname.startsWith('127.')) {
    io.note(`warning: ${url} is plain http://; the token crosses the network unencrypted. Use the https:// address if the portal has one.`);
  }
  if (opts.token !== undefined && process.stdin.isTTY) {
    io.note('warning: a token on the command line stays in your shell history and shows in `ps` to others on this node; next time let `localis login` ask for it, or pipe it in.');
  }

  const token = await obtainToken(
    {
      given: opts.token,
      promptText:
        `Create an API token on ${url}/profile under "API tokens" (scope "read"; add "runs" and "archives" to record runs and upload results).\n` +
        'Paste it here (it is not shown): ',
    },
    source,
  );

  let me: Profile;
  try {
    me = await new ApiClient({ url, token }).get('/me', Profile);
  } catch (e) {
    // Errors without advice of their own (a refusal, an odd answer) get the one fact that matters here.
    if (isCliError(e) && !e.hint) {
      throw new CliError(e.message, { exitCode: e.exitCode, details: e.details, hint: 'The token was not stored.', cause: e });
    }
    throw e;
  }

  const path = saveProfile(profile, { url, token }, env);
  const roles = me.person.roles.join(', ') || 'none';
  io.out(`Signed in to ${url} as ${me.person.name} <${me.person.email}> (roles: ${roles})`);
  io.out(`Token ${maskToken(token)} stored as profile "${profile}" in ${path}`);
  if (env.LOCALIS_TOKEN?.trim()) {
    io.note('LOCALIS_TOKEN is set in this shell and wins over the stored token; unset it to use this profile.');
  }
  if (env.LOCALIS_URL && normaliseUrl(env.LOCALIS_URL) !== url) {
    io.note(`LOCALIS_URL (${env.LOCALIS_URL}) is set in this shell and wins over ${url}; unset it to use this profile.`);
  }
}
