import { Command } from 'commander';
import { DEFAULT_PROFILE } from '../lib/credentials';
import type { VerifyOptions } from '../lib/verify';

export function verifyCommand(): Command {
  return new Command('verify')
    .summary("check a result archive as the portal does, and its entry in the provenance log; or the log's signed head")
    .description(
      "Check a result archive on this machine with the portal's own checks (checksums, safe unpacking, " +
        'manifest, tables, and with --campaign-spec the campaign\'s plan). With a portal signed in, also find ' +
        'the archive in the provenance log by its SHA-256 and check the entry, its inclusion proof and the ' +
        "signed tree head. With --log, check the log's latest signed head and that the log only grew since the last check.",
    )
    .argument('[archive]', 'the archive file (.tar.gz, .tgz, .tar or .zip)')
    .option('--campaign-spec <spec.json>', "compare with the campaign's plan: its spec, or the campaign as GET /api/v1/campaigns/<id> answers it")
    .option('--offline', 'do not ask the portal, even when signed in', false)
    .option('--require-log', 'fail when the archive is not in the provenance log (by default that is only said)', false)
    .option('--log', "check the provenance log's signed head, and that it extends the head saved by the last check", false)
    .option('--head <file>', 'with --log: the saved head to check against and update (default <config dir>/provenance-head.json)')
    .option('--json', 'print what was checked as JSON, for scripts', false)
    .option('--profile <name>', 'use the token stored under this name', DEFAULT_PROFILE)
    .addHelpText(
      'after',
      `
Examples:
  $ localis verify results.tar.gz                           # before uploading, or after
  $ localis verify results.tar.gz --campaign-spec spec.json # also against the plan
  $ localis verify results.tar.gz --offline                 # no portal asked
  $ localis verify results.tar.gz --require-log --json | jq .log.checks
  $ localis verify --log                                    # the log's head, and that it only grew
  $ localis verify --log --head ~/shared/localis-head.json

The checks on this machine are the ones the portal's worker runs, from the same code.
With a portal signed in (a stored profile, or LOCALIS_URL and LOCALIS_TOKEN) and
without --offline, the archive's log entry is found by the file's SHA-256 and checked:
its content hashes to its leaf, it names this file's SHA-256, its inclusion proof leads
to the root of a signed tree head, and that head is signed by the portal's key. The
key is pinned on first use in <config dir>/provenance-key.json; a changed key is
reported as a failure, never accepted silently.

--log checks the latest signed head and, when a head was saved by an earlier check,
asks for a consistency proof from it: the log must only have grown. The new head is
saved only when every check passed.

Exit code 0: no problems. 1: a problem (one line each, with its code and file) or a
failed log check. 2: a bad option or a file that is not an archive. 3: --log without
a sign-in. 130: cancelled with Ctrl-C.`,
    )
    .action(async (archive: string | undefined, opts: VerifyOptions) => {
      // Loaded when run: the archive code (zlib, tar, zip, the store's SDK) is not every command's startup cost.
      const { verify } = await import('../lib/verify');
      await verify(archive, opts);
    });
}
