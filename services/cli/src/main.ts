import { Command, CommanderError } from 'commander';
import { analyzeCommand } from './commands/analyze.command';
import { estimateCommand } from './commands/estimate.command';
import { loginCommand } from './commands/login.command';
import { logoutCommand } from './commands/logout.command';
import { runsCommand } from './commands/runs.command';
import { packCommand } from './commands/pack.command';
import { tmmCommand } from './commands/tmm.command';
import { uploadCommand } from './commands/upload.command';
import { verifyCommand } from './commands/verify.command';
import { whoamiCommand } from './commands/whoami.command';
import { EXIT, formatError, isCliError } from './lib/cli-error';
import { CLI_VERSION } from './lib/version';

const program = new Command('localis')
  .description('Command line of Localis, the consortium portal for core-hour grants, runs and result archives of Anderson-localization campaigns.')
  .version(CLI_VERSION, '-V, --version', 'print the version of localis')
  .helpOption('-h, --help', 'show help for localis or a command')
  .helpCommand('help [command]', 'show help for a command')
  // Thrown instead of exiting, so usage errors get exit code 2 and nothing is cut off mid-output.
  .exitOverride()
  .showHelpAfterError('(run `localis <command> --help` for usage)')
  // One prefix for every message on stderr, whether commander or our code wrote it.
  .configureOutput({ outputError: (text, write) => write(text.replace(/^error: /, 'localis: ')) })
  .addHelpText(
    'after',
    `
Start with:
  $ localis login --url https://<portal address>   # paste an API token from your profile page
  $ localis whoami

Record runs on a granted campaign (token scope "runs"):
  $ localis runs add --campaign <id> --file run.json
  $ localis runs list --campaign <id>

Result archives (token scope "archives"):
  $ localis pack results/ --campaign <id> --code-name tmm ... # manifest + archive
  $ localis verify results.tar.gz                 # the portal's checks, here
  $ localis upload results.tar.gz --campaign <id> # resumable; waits for the check
  $ localis verify --log                          # the provenance log's signed head

Offline, without signing in:
  $ localis estimate spec.json                    # core-hours and memory of a campaign spec
  $ localis tmm --dim 3 --width 6 --disorder 16.5 # Lambda = xi/L by the transfer-matrix kernel
  $ localis analyze lambda.csv                    # W_c and nu by finite-size scaling

Environment:
  LOCALIS_URL         portal address; wins over the stored profile
  LOCALIS_TOKEN       API token; wins over the stored profile (for batch scripts)
  LOCALIS_CONFIG_DIR  where credentials.json, unfinished uploads and the pinned log key
                      are kept (default ~/.config/localis)
  LOCALIS_DEBUG       set to 1 to show where an unexpected error happened

Exit codes: 0 ok, 1 failed, 2 usage error, 3 not signed in or token refused, 130 cancelled (Ctrl-C).`,
  );

/** addCommand() does not pass the settings down by itself, unlike .command(); nor to `runs add`. */
function inheritSettings(parent: Command, command: Command): Command {
  command.copyInheritedSettings(parent);
  for (const sub of command.commands) inheritSettings(command, sub);
  return command;
}
for (const command of [
  loginCommand(),
  whoamiCommand(),
  logoutCommand(),
  runsCommand(),
  packCommand(),
  uploadCommand(),
  verifyCommand(),
  estimateCommand(),
  tmmCommand(),
  analyzeCommand(),
]) {
  program.addCommand(inheritSettings(program, command));
}

// `localis whoami --json | head -1` closes the pipe early; that is not an error worth a stack.
process.stdout.on('error', (e: NodeJS.ErrnoException) => {
  if (e.code === 'EPIPE') process.exit(process.exitCode ?? EXIT.ok);
  throw e;
});

try {
  await program.parseAsync(process.argv);
} catch (e) {
  if (e instanceof CommanderError) {
    // Commander has already printed the help or the usage error.
    process.exitCode = e.exitCode === 0 ? EXIT.ok : EXIT.usage;
  } else {
    process.stderr.write(`${formatError(e)}\n`);
    process.exitCode = isCliError(e) ? e.exitCode : EXIT.failed;
  }
}
