import { Command } from 'commander';
import type { PackOptions } from '../lib/pack-options';

export function packCommand(): Command {
  return new Command('pack')
    .summary('write a result archive with its manifest from a folder of results (offline)')
    .description(
      'Pack a folder of results into a result archive the portal accepts: manifest.json (the campaign, ' +
        'runs, code, machine and grid, and every file with its size and SHA-256) first, then the files. ' +
        'Offline: no sign-in needed.',
    )
    .argument('<dir>', 'the folder of results: CSV tables (L,W,E,lambda,lambda_err or L,W,E,g,g_err) and any other files')
    .option('--campaign <id>', "the campaign's id, from the end of its page's address in the portal")
    .option('--code-name <name>', 'the code that produced the results, e.g. tmm-anderson')
    .option('--code-version <v>', "the code's version, e.g. 2.3.1")
    .option('--code-commit <hash>', "the code's commit, 7 to 64 hexadecimal digits")
    .option('--machine <name>', 'the machine the runs used, as the campaign names it')
    .option('--sizes <list>', 'system sizes L covered, e.g. 8,12,16')
    .option('--disorder <list>', 'disorder values W covered, e.g. 16.5,17')
    .option('--energies <list>', 'energies E covered, e.g. 0')
    .option('--realizations <n>', 'disorder realizations per point')
    .option('--seeds <list>', 'seeds used, e.g. 1,2 (may be left out)')
    .option('--runs <list>', 'ids of the recorded runs the results come from, separated by commas')
    .option('--format <format>', 'tar.gz (default), tar or zip; by default from --out')
    .option('--out <file>', 'the archive to write (default: beside the folder, named after it, e.g. results.tar.gz)')
    .option('--json', 'print the archive path, size, SHA-256 and manifest as JSON', false)
    .addHelpText(
      'after',
      `
Examples:
  $ localis pack results/ --campaign 3f2c8a4e-0b1d-4e6f-9a7b-2c5d8e1f4a6b \\
      --code-name tmm-anderson --code-version 2.3.1 --code-commit 9f3e2a1c --machine fjell \\
      --sizes 8,12,16 --disorder 17,17.5 --energies 0 --realizations 1000 --seeds 1,2 \\
      --runs 5e2d9c1a-0b1d-4e6f-9a7b-2c5d8e1f4a6b
  $ localis pack results/ ... --format zip --out /scratch/me/w17.zip
  $ localis pack results/ ... --json | jq -r .sha256

Every regular file under the folder goes in (symbolic links and special files are
left out, and a manifest.json there is replaced); at least one .csv result table is
needed. Files are read once to hash them, then streamed into the archive, so memory
stays small whatever their size. The archive is written under a temporary name and
renamed once complete. Prints its path, size and SHA-256; check it with
\`localis verify\` and send it with \`localis upload\`.

Exit code 2: an option is missing or not valid (each is named), the folder holds no
table, or --out is inside the folder. Exit code 1: a file could not be read or written.`,
    )
    .action(async (dir: string, opts: PackOptions) => {
      // Loaded when run: the archive code (zlib, tar, zip, the store's SDK) is not every command's startup cost.
      const { pack } = await import('../lib/pack');
      await pack(dir, opts);
    });
}
