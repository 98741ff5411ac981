import { Command } from 'commander';
import { DEFAULT_REORTHOGONALIZE_EVERY } from '@localis/shared';
import { tmm } from '../lib/tmm';
import { DEFAULT_PRECISION, DEFAULT_SEED, type TmmRawOptions } from '../lib/tmm-options';

export function tmmCommand(): Command {
  return (
    new Command('tmm')
      .summary('localization length of one point (d, L, W, E) by the transfer-matrix method (offline)')
      .description(
        'Compute the localization length xi and Lambda = xi/L of the Anderson model (box disorder, ' +
          'hopping 1, periodic across) on a bar of width L, with the transfer-matrix kernel the ' +
          'portal uses for its spot checks. Offline: no sign-in needed. Runs on one core.',
      )
      // Numbers arrive as text and are checked together, so every bad option is named at once.
      .option('--dim <d>', 'dimension d: 1, 2 or 3')
      .option('--width <L>', 'width L of the bar; its cross-section has L^(d-1) sites (1 in d = 1, the default there)')
      .option('--disorder <W>', 'disorder W: on-site energies uniform in [-W/2, W/2]')
      .option('--energy <E>', 'energy E', '0')
      .option('--precision <eps>', `stop when the relative error of gamma_min is at most eps, 0 < eps < 1 (default ${DEFAULT_PRECISION} when --slices is not given)`)
      .option('--slices <N>', 'stop after N slices (with --precision: whichever comes first)')
      .option('--seed <S>', 'seed of the disorder; the same seed gives the same result', String(DEFAULT_SEED))
      .option('--reorthogonalize-every <q>', 'slices between two re-orthonormalizations (QR)', String(DEFAULT_REORTHOGONALIZE_EVERY))
      .option('--allow-long', 'run even when it is expected to take more than an hour', false)
      .option('--json', 'print the result as one JSON object, for scripts', false)
      .addHelpText(
        'after',
        `
Examples:
  $ localis tmm --dim 3 --width 6 --disorder 16.5                  # Lambda at 1 % precision
  $ localis tmm --dim 2 --width 16 --disorder 6 --precision 0.005
  $ localis tmm --dim 1 --disorder 2 --energy 1 --slices 200000 --json | jq .xi
  $ localis tmm --dim 3 --width 8 --disorder 16 --seed 7 --json > w16-l8.json

--dim, --disorder and (for d = 2, 3) --width are required. With neither
--precision nor --slices the run stops at a relative error of ${DEFAULT_PRECISION}. Runs expected
to take over an hour (slices about L / eps², each costing about
2(2d-1) N_ch² + (10/3) N_ch³ / q operations, N_ch = L^(d-1), at a cautious
5e8 operations/s) are refused unless --allow-long is given.

On a terminal a progress line shows the slices, the relative error and how far
the run is; Ctrl-C stops the run (exit code 130). --json prints
{ dim, width, disorder, energy, slices, gammaMin, gammaErr, xi, xiErr, lambda,
lambdaErr, seconds }. Exit code 2 means an option is not valid or the run
would be too long; each problem is named with its option.`,
      )
      .action(async (opts: TmmRawOptions) => {
        await tmm(opts);
      })
  );
}
