import { Command } from 'commander';
import { DEFAULT_PROFILE } from '../lib/credentials';
import { collectRuns, MAX_PARALLEL, type UploadOptions } from '../lib/upload-options';

export function uploadCommand(): Command {
  return new Command('upload')
    .summary('upload a result archive to a granted campaign, resuming where an earlier attempt stopped')
    .description(
      'Upload a result archive (.tar.gz, .tgz, .tar or .zip) to a granted campaign: the file goes in ' +
        'parts straight to the object store, its SHA-256 is computed on the way, and the portal then ' +
        'checks it. An interrupted upload goes on where it stopped when the same command is run again.',
    )
    .argument('<archive>', 'the archive file, e.g. one `localis pack` wrote')
    .requiredOption('--campaign <id>', "the campaign's id, from the end of its page's address in the portal")
    .option('--run <id>', 'a run whose results the archive holds (repeat it, or separate ids by commas); the manifest must list them too', collectRuns)
    .option('--kind <kind>', 'results, or science-case / pilot-timings for a proposal attachment', 'results')
    .option('--parallel <n>', `parts sent at the same time, 1 to ${MAX_PARALLEL}`, '4')
    .option('--limit-rate <MB/s>', 'send at most this many megabytes per second (leave room on a shared login node)')
    .option('--no-wait', 'stop once the upload is complete, without waiting for the check')
    .option('--json', 'print the archive and what was sent as JSON, for scripts', false)
    .option('--stats', 'print the peak memory (RSS) of this process, the bytes sent, the seconds and the speed', false)
    .option('--profile <name>', 'use the token stored under this name', DEFAULT_PROFILE)
    .addHelpText(
      'after',
      `
Examples:
  $ localis upload results.tar.gz --campaign 3f2c8a4e-0b1d-4e6f-9a7b-2c5d8e1f4a6b
  $ localis upload results.tar.gz --campaign "$CAMPAIGN" --run "$RUN1" --run "$RUN2"
  $ localis upload big.tar --campaign "$CAMPAIGN" --limit-rate 50 --no-wait
  $ localis upload results.tar.gz --campaign "$CAMPAIGN" --json | jq -r .archive.state

The file is cut into parts of 8 MiB (more for files over 78 GiB); 4 go at a time, each
read from the file into its own buffer, so memory stays the same whatever the size.
A failed part is tried again (5 times, waiting 1, 2, 4, 8, 16 s), with a fresh address
when the store says 403. On a terminal a bar shows the bytes sent, the speed and the
time left; into a log, a line every 5 seconds.

Interrupted (Ctrl-C, a dropped connection, a killed job)? Run the same command again:
the upload is remembered under the config folder (by the file's path, size and time
of change, and the campaign) and only the parts the store does not hold are sent;
the whole file is still read once for its SHA-256. A file changed since is a new upload.

Then the portal checks the archive (checksums, manifest, tables, the campaign's plan);
localis waits and exits 0 when it is verified, or 1 with a line per problem when it
is rejected. --no-wait exits once the upload is complete. The token needs the scope
"archives". Exit code 2: a bad option or file name, nothing sent; 3: not signed in;
130: interrupted.`,
    )
    .action(async (archive: string, opts: UploadOptions) => {
      // Loaded when run: the archive code (zlib, tar, zip, the store's SDK) is not every command's startup cost.
      const { upload } = await import('../lib/upload');
      await upload(archive, opts);
    });
}
