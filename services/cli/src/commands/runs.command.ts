import { Command } from 'commander';
import { DEFAULT_PROFILE } from '../lib/credentials';
import { addRun, listRuns, type AddRunOptions, type ListRunsOptions } from '../lib/runs';

export function runsCommand(): Command {
  const runs = new Command('runs')
    .summary('record the runs of a granted campaign and list them')
    .description('Record a run on a granted campaign (its core-hours are charged to the grant) and list the runs recorded so far.');

  runs.addCommand(
    new Command('add')
      .summary('record one run and charge its core-hours to the campaign')
      .description(
        'Record one run on a granted campaign. The run is checked here first; the portal then charges ' +
          'cores x wall-clock hours (or --core-hours) to the grant and answers with the run and what remains.',
      )
      .requiredOption('--campaign <id>', "the campaign's id, from the end of its page's address in the portal")
      // Values arrive as text and are checked together, so every mistake is listed at once.
      .option('--job <id>', "the scheduler's job id")
      .option('--machine <name>', 'the machine the run used, e.g. cluster-a')
      .option('--start <time>', 'start, ISO 8601 with a zone, e.g. 2027-02-01T08:00:00Z')
      .option('--end <time>', 'end, ISO 8601 with a zone')
      .option('--cores <n>', 'cores the run held')
      .option('--core-hours <x>', 'core-hours to charge when they are not cores x wall-clock (e.g. from the accounting)')
      .option('--code <name>', 'the code that ran')
      .option('--code-version <v>', "the code's version or commit")
      .option('--sizes <list>', 'system sizes L, e.g. 12,16')
      .option('--disorder <list>', 'disorder values W, e.g. 16.5,17')
      .option('--energies <list>', 'energies E, e.g. 0')
      .option('--seeds <list>', 'seeds, e.g. 1,2')
      .option('--file <run.json>', 'the run as one JSON object instead of the options above; - reads standard input')
      .option('--idempotency-key <key>', 'key that makes sending the run again harmless (default: derived from the campaign and the run)')
      .option('--json', "print the portal's answer (the recorded run) as JSON, for scripts", false)
      .option('--profile <name>', 'use the token stored under this name', DEFAULT_PROFILE)
      .addHelpText(
        'after',
        `
Examples:
  $ localis runs add --campaign 3f2c8a4e-0b1d-4e6f-9a7b-2c5d8e1f4a6b --job 4711 --machine cluster-a \\
      --start 2027-02-01T08:00:00Z --end 2027-02-01T20:00:00Z --cores 128 \\
      --code tmm --code-version 1.4.2 --sizes 12,16 --disorder 16.5,17 --energies 0 --seeds 1,2
  $ localis runs add --campaign 3f2c8a4e-0b1d-4e6f-9a7b-2c5d8e1f4a6b --file run.json
  $ localis runs add --campaign "$CAMPAIGN" --file run.json --json | jq .coreHours

That run holds 128 cores for 12 hours: 1,536 core-hours are charged. A run file
holds the same fields:
  {
    "externalJobId": "4711", "machine": "cluster-a",
    "startedAt": "2027-02-01T08:00:00Z", "endedAt": "2027-02-01T20:00:00Z",
    "cores": 128, "codeName": "tmm", "codeVersion": "1.4.2",
    "parameters": { "sizes": [12, 16], "disorder": [16.5, 17], "energies": [0], "seeds": [1, 2] }
  }
("coreHours" and "parameters" may be left out.)

Sending the same run again, e.g. after a timeout, records and charges it once: the
Idempotency-Key is the SHA-256 of the campaign and the run. The portal refuses a job id
already recorded on that machine, a campaign that is not granted, and a run that needs
more than the grant has left (beyond the round's overdraft allowance, if any).

Exit code 2: the run is not valid (each problem is listed with its field) and nothing
was sent. Exit code 1: the portal refused it (its reason is printed) or could not be
reached. Exit code 3: not signed in. The token needs the scope "runs".`,
      )
      .action(async (opts: AddRunOptions) => {
        await addRun(opts);
      }),
  );

  runs.addCommand(
    new Command('list')
      .summary('list the runs recorded on a campaign, newest first')
      .description('List the runs recorded on a campaign, newest first, with their core-hours and a total.')
      .requiredOption('--campaign <id>', "the campaign's id, from the end of its page's address in the portal")
      .option('--limit <n>', 'show only the latest n runs (default: all)')
      .option('--json', "print the runs as the portal gives them, one JSON array, for scripts", false)
      .option('--profile <name>', 'use the token stored under this name', DEFAULT_PROFILE)
      .addHelpText(
        'after',
        `
Examples:
  $ localis runs list --campaign 3f2c8a4e-0b1d-4e6f-9a7b-2c5d8e1f4a6b
  $ localis runs list --campaign "$CAMPAIGN" --limit 20
  $ localis runs list --campaign "$CAMPAIGN" --json | jq -r '.[].externalJobId'`,
      )
      .action(async (opts: ListRunsOptions) => {
        await listRuns(opts);
      }),
  );
  return runs;
}
