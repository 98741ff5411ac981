import { Command } from 'commander';
import { DEFAULT_PROFILE } from '../lib/credentials';
import { whoami } from '../lib/whoami';

export function whoamiCommand(): Command {
  return new Command('whoami')
    .summary('show who the stored token signs you in as')
    .description('Show who the token signs you in as: name, e-mail, institution, roles and groups, and which portal and token are used.')
    .option('--json', 'print the portal\'s profile answer as JSON, for scripts', false)
    .option('--profile <name>', 'use the token stored under this name', DEFAULT_PROFILE)
    .addHelpText(
      'after',
      `
Examples:
  $ localis whoami
  $ localis whoami --json | jq -r '.groups[].name'
  $ LOCALIS_TOKEN=$(cat ~/.localis-token) localis whoami     # in a batch script

Exit code 3 means no token is stored or the portal refused it: run \`localis login\`.`,
    )
    .action(async (opts: { json: boolean; profile: string }) => {
      await whoami(opts);
    });
}
