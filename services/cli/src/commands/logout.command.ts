import { Command } from 'commander';
import { DEFAULT_PROFILE } from '../lib/credentials';
import { logout } from '../lib/logout';

export function logoutCommand(): Command {
  return new Command('logout')
    .summary('forget the stored token on this machine')
    .description(
      'Forget the token stored on this machine. The token itself stays valid until it expires or you\n' +
        'revoke it on your profile page, section "API tokens" (do that if it may have leaked).',
    )
    .option('--profile <name>', 'forget the token stored under this name', DEFAULT_PROFILE)
    .addHelpText(
      'after',
      `
Examples:
  $ localis logout
  $ localis logout --profile test`,
    )
    .action((opts: { profile: string }) => {
      logout(opts);
    });
}
