import { CampaignSpec, detailsFromZod, estimateReport, parsePilotCsv, type ErrorDetail } from '@localis/shared';
import { CliError, EXIT } from './cli-error';
import { formatEstimate } from './format-estimate';
import { terminalOutput, type Output } from './output';
import { parseJson } from './parse-json';
import { readInput } from './read-input';

export interface EstimateOptions {
  json: boolean;
  /** A pilot-timings CSV (size,seconds,cores), or `-` for standard input. */
  pilot?: string;
}

/**
 * The cost estimate of a campaign spec, worked out here with the same shared code the portal
 * uses, so a proposal can be sized on a login node before anyone signs in or the portal is up.
 */
export async function estimate(specPath: string, opts: EstimateOptions, io: Output = terminalOutput): Promise<void> {
  if (specPath === '-' && opts.pilot === '-') {
    throw new CliError('the spec and --pilot cannot both come from standard input; give one of them as a file.', { exitCode: EXIT.usage });
  }
  const specInput = await readInput(specPath, 'campaign spec');
  const raw = parseJson(specInput.text, specInput.name);
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    throw new CliError(`${specInput.name} holds ${Array.isArray(raw) ? 'an array' : `a ${raw === null ? 'null' : typeof raw}`}, not a campaign spec; it should be one JSON object.`, {
      exitCode: EXIT.usage,
      hint: 'See `localis estimate --help` for an example.',
    });
  }

  let candidate = raw as Record<string, unknown>;
  let pilotName: string | undefined;
  const pilotProblems: ErrorDetail[] = [];
  if (opts.pilot !== undefined) {
    const pilotInput = await readInput(opts.pilot, 'pilot-timings CSV');
    pilotName = pilotInput.name;
    const { timings, problems } = parsePilotCsv(pilotInput.text);
    pilotProblems.push(...problems);
    if (Array.isArray(candidate.pilotTimings) && candidate.pilotTimings.length > 0) {
      io.note(`--pilot replaces the ${candidate.pilotTimings.length} pilot timings written in ${specInput.name}.`);
    }
    // Unusable pilots are reported once, from the CSV reader, not again by the spec's own checks.
    candidate = { ...candidate, pilotTimings: problems.length ? undefined : timings };
  }

  const parsed = CampaignSpec.safeParse(candidate);
  const specProblems = parsed.success ? [] : detailsFromZod(parsed.error);
  if (!parsed.success || pilotProblems.length) {
    const what = [
      specProblems.length ? `${specInput.name} is not a valid campaign spec` : '',
      pilotProblems.length ? `the pilot timings in ${pilotName} cannot be used` : '',
    ].filter(Boolean);
    throw new CliError(`${what.join(', and ')}:`, {
      exitCode: EXIT.usage,
      details: [...specProblems, ...pilotProblems],
      hint: 'The fields and an example are in `localis estimate --help`.',
    });
  }

  const report = estimateReport(parsed.data);
  // The report as the portal's estimate endpoint answers it, for jq and spreadsheets.
  if (opts.json) io.out(JSON.stringify(report, null, 2));
  else io.out(formatEstimate(parsed.data, report));
}
