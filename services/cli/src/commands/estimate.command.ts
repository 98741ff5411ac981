import { Command } from 'commander';
import { estimate } from '../lib/estimate';

export function estimateCommand(): Command {
  return new Command('estimate')
    .summary('estimate the core-hours and memory of a campaign spec (offline)')
    .description(
      'Estimate the core-hours and peak memory of a campaign spec per system size L,\n' +
        'with the scaling-theory notices the portal shows. Offline: no sign-in needed.',
    )
    .argument('<spec>', 'campaign spec as a JSON file, or - to read it from standard input')
    .option('--json', 'print the whole estimate as one JSON object, for scripts', false)
    .option('--pilot <csv>', 'pilot timings (columns size,seconds,cores) to calibrate the speed to your machine; replaces any pilotTimings in the spec')
    .addHelpText(
      'after',
      `
Examples:
  $ localis estimate spec.json
  $ localis estimate spec.json --pilot timings.csv
  $ localis estimate spec.json --json | jq '.totalCoreHours'
  $ make-spec | localis estimate -

A spec is one JSON object, e.g.
  {
    "model": "anderson-box", "dimension": 3, "symmetryClass": "AI",
    "goal": "critical-point",
    "sizes": [6, 8, 12, 16],
    "disorder": { "from": 15, "to": 18, "step": 0.25 },
    "energies": [0], "realizations": 1,
    "method": "transfer-matrix", "targetPrecision": 0.002,
    "methodOptions": { "expectedLambda": 0.6 },
    "node": { "coresPerNode": 64, "memoryGiBPerNode": 256 }
  }
The disorder grid may instead be a list: "disorder": { "values": [15, 16.5, 18] }.
Methods: transfer-matrix, exact-diagonalization, shift-invert, kernel-polynomial,
recursive-green. A pilot CSV has one line per measured job of this campaign's settings:
  size,seconds,cores
  8,41.5,1

Exit code 2 means the spec or the pilot CSV is not valid; each problem is listed
with its field, e.g. "disorder.step: step must be greater than 0". Exit code 1
means a file could not be read.`,
    )
    .action(async (spec: string, opts: { json: boolean; pilot?: string }) => {
      await estimate(spec, opts);
    });
}
