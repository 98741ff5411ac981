import { DEFAULT_PROFILE, removeProfile } from './credentials';
import { maskToken } from './mask-token';
import { terminalOutput, type Output } from './output';

/**
 * Only forgets the token on this machine: the same token is often also in batch scripts on other
 * clusters, and revoking it from here would break those jobs without warning.
 */
export function logout(opts: { profile: string }, io: Output = terminalOutput, env: NodeJS.ProcessEnv = process.env): void {
  const removed = removeProfile(opts.profile, env);
  const which = opts.profile === DEFAULT_PROFILE ? '' : ` for profile "${opts.profile}"`;
  if (!removed) {
    io.out(`No token is stored${which}; nothing to forget.`);
  } else {
    io.out(`Forgot the token ${maskToken(removed.token)}${which} (${removed.url}).`);
    io.out(`It stays valid until it expires or you revoke it on ${removed.url}/profile under "API tokens".`);
  }
  if (env.LOCALIS_TOKEN?.trim()) {
    io.note('LOCALIS_TOKEN is still set in this shell; commands keep using it until you unset it.');
  }
}
