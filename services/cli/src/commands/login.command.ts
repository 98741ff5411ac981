import { Command } from 'commander';
import { DEFAULT_URL } from '../lib/connection';
import { DEFAULT_PROFILE } from '../lib/credentials';
import { login } from '../lib/login';

export function loginCommand(): Command {
  return new Command('login')
    .summary('check an API token and store it on this machine')
    .description(
      'Check an API token against the portal and store it, readable only by you, for the other commands.\n' +
        'Create the token in the portal: your profile page, section "API tokens".',
    )
    .option('--url <url>', `portal address (default: $LOCALIS_URL, else the profile's stored address, else ${DEFAULT_URL})`)
    .option('--token <token>', 'the API token; without it, it is read from a pipe or asked for with hidden input')
    .option('--profile <name>', 'store it under this name, to keep tokens for several portals or accounts', DEFAULT_PROFILE)
    .addHelpText(
      'after',
      `
Examples:
  $ localis login --url https://localis.example.org     # asks for the token, input hidden
  $ localis login < ~/.localis-token                    # token from a file (chmod 600 it)
  $ localis login --profile test --url http://127.0.0.1:4200

A token given with --token stays in your shell history and shows in \`ps\` on a
shared login node; prefer the prompt or a pipe. A token the portal refuses is
not stored (exit code 3).`,
    )
    .action(async (opts: { url?: string; token?: string; profile: string }) => {
      await login(opts);
    });
}
