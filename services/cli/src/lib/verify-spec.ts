import { z } from 'zod';
import { CampaignSpec, detailsFromZod, type ArchiveProblem } from '@localis/shared';
import type { CampaignContext } from '@localis/shared/node';
import { CliError, EXIT } from './cli-error';
import { parseJson } from './parse-json';
import { readInput } from './read-input';

/**
 * The campaign an archive is checked against offline: its planned grid from a spec file, and, when
 * the file is the campaign as the portal answers it (`GET /api/v1/campaigns/<id>`), its id and
 * machine too. Runs cannot be known offline: the portal checks them.
 */
export interface OfflineCampaign {
  /** How messages name the file. */
  name: string;
  spec: CampaignContext['spec'];
  id: string | null;
  machine: string | null;
}

const CampaignFile = z.object({ id: z.uuid(), machine: z.string(), spec: z.record(z.string(), z.unknown()) });

/** Reads `--campaign-spec`: a campaign spec (as `localis estimate` takes) or a whole campaign. */
export async function readOfflineCampaign(path: string): Promise<OfflineCampaign> {
  const input = await readInput(path, 'campaign spec');
  const raw = parseJson(input.text, input.name);
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    throw new CliError(`${input.name} is not a campaign spec; it should be one JSON object.`, { exitCode: EXIT.usage });
  }
  const asCampaign = CampaignFile.safeParse(raw);
  const specJson = asCampaign.success ? asCampaign.data.spec : raw;
  const spec = CampaignSpec.safeParse(specJson);
  if (!spec.success) {
    throw new CliError(`${input.name} is not a valid campaign spec:`, {
      exitCode: EXIT.usage,
      details: detailsFromZod(spec.error),
      hint: 'Give the spec the campaign was proposed with, or the campaign as the portal answers GET /api/v1/campaigns/<id>.',
    });
  }
  return {
    name: input.name,
    spec: { sizes: spec.data.sizes, disorder: spec.data.disorder, energies: spec.data.energies },
    id: asCampaign.success ? asCampaign.data.id : null,
    machine: asCampaign.success ? asCampaign.data.machine : null,
  };
}

/** Stands for "not known offline"; problems naming it are about what could not be compared. */
const UNKNOWN_CAMPAIGN_ID = '00000000-0000-4000-8000-000000000000';
const UNKNOWN_MACHINE = 'localis-offline-unknown-machine';

/** Accepts every run: which runs a campaign has is known to the portal only. */
class AnyRun extends Set<string> {
  override has(): boolean {
    return true;
  }
}

/** The checker's campaign context for an offline check; see `offlineProblems` for what it cannot judge. */
export function offlineContext(c: OfflineCampaign): CampaignContext {
  return { id: c.id ?? UNKNOWN_CAMPAIGN_ID, machine: c.machine ?? UNKNOWN_MACHINE, spec: c.spec, runIds: new AnyRun() };
}

/** Drops the findings about the campaign's id and machine when the spec file did not give them. */
export function offlineProblems(problems: ArchiveProblem[], c: OfflineCampaign | null): ArchiveProblem[] {
  if (!c) return problems;
  return problems.filter((p) => {
    if (p.code === 'campaign-mismatch' && c.id === null) return false;
    if (p.code === 'outside-spec' && c.machine === null && p.message.includes(UNKNOWN_MACHINE)) return false;
    return true;
  });
}
