import { Command } from 'commander';
import { analyze } from '../lib/analyze';
import { DEFAULT_BOOTSTRAP, DEFAULT_SEED, type AnalyzeRawOptions } from '../lib/analyze-options';

export function analyzeCommand(): Command {
  return (
    new Command('analyze')
      .summary('finite-size scaling analysis of a table of Lambda or g (offline)')
      .description(
        'Fit the finite-size scaling function to a table of Lambda = xi/L (or the conductance g) ' +
          'against the disorder W for three sizes L or more, with the analysis the portal runs: the ' +
          'critical point W_c, the exponent nu and the critical value with 95 % intervals, a scan of ' +
          'models, the crossings of successive sizes and the beta function. Offline: no sign-in needed.',
      )
      .argument('<table>', 'the table as a CSV file, or - to read it from standard input')
      // Numbers arrive as text and are checked together, so every bad option is named at once.
      .option('--observable <name>', 'lambda (columns lambda,lambda_err) or g (columns g,g_err)', 'lambda')
      .option('--orders <nr,ni>', 'fit this model: order nr in the relevant and ni in the irrelevant scaling variable (default: the scan chooses)')
      .option('--bootstrap <N>', 'bootstrap refits for the intervals; 0 gives linearized intervals', String(DEFAULT_BOOTSTRAP))
      .option('--energy <E>', 'the energy to analyze when the table holds several')
      .option('--seed <S>', 'seed of the bootstrap; the same seed gives the same intervals', String(DEFAULT_SEED))
      .option('--json', 'print the whole analysis as one JSON object, for scripts', false)
      .addHelpText(
        'after',
        `
Examples:
  $ localis analyze lambda.csv
  $ localis analyze lambda.csv --orders 3,1 --bootstrap 500
  $ localis analyze results.csv --energy 0 --json | jq '.Wc, .nu'
  $ localis analyze conductance.csv --observable g
  $ make-table | localis analyze -

A table is CSV with a header line; columns L,W,E,lambda,lambda_err (or
L,W,E,g,g_err with --observable g) in any order, E optional, extra columns
ignored, blank and # lines skipped. One line per (L, W) point:
  L,W,E,lambda,lambda_err
  6,16.0,0,0.6243,0.0031

Without --orders a small scan of models is fitted and the simplest with p >= 0.1
is reported. On a terminal a progress line shows the fits; Ctrl-C stops them
(exit code 130). --json prints { model, Wc, nu, critical, chi2, dof, p,
parameters, intervals, scan, crossings, crossingDrift, beta, collapse,
warnings }, intervals as { value, lo, hi }.

Exit code 2 means the options or the table are not valid (a malformed line is
named by its number), the table holds several energies and --energy is missing,
or the data do not allow the fit (fewer than three sizes, say). Exit code 1
means the file could not be read.`,
      )
      .action(async (table: string, opts: AnalyzeRawOptions) => {
        await analyze(table, opts);
      })
  );
}
