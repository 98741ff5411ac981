import type { DisorderGrid } from '../../campaigns/campaign-spec.schema';
import { ArchiveManifest } from '../archive.schema';
import { formatBytes, type SeenFile } from './archive-inspector';
import { MANIFEST_NAME } from './entry-names';
import type { ProblemList } from './problem-list';
import { describeDisorderSpan, disorderInSpec, energyInSpec, shortList, sizeInSpec, type SpecBounds } from './spec-bounds';

/** The campaign an archive is filed under, as the api knows it. */
export interface CampaignContext {
  id: string;
  machine: string;
  spec: { sizes: number[]; disorder: DisorderGrid; energies: number[] };
  runIds: ReadonlySet<string>;
}

/** manifest.json's bytes, parsed and validated; one problem per zod issue. */
export function parseManifest(bytes: Buffer | 'too-large', maxBytes: number, problems: ProblemList): ArchiveManifest | null {
  if (bytes === 'too-large') {
    problems.add('manifest-invalid', `${MANIFEST_NAME} is larger than ${formatBytes(maxBytes)}, the most a manifest may be`, MANIFEST_NAME);
    return null;
  }
  let json: unknown;
  try {
    json = JSON.parse(new TextDecoder('utf-8', { fatal: true }).decode(bytes));
  } catch (error) {
    problems.add('manifest-invalid', `${MANIFEST_NAME} is not valid UTF-8 JSON: ${(error as Error).message}`, MANIFEST_NAME);
    return null;
  }
  const parsed = ArchiveManifest.safeParse(json);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const where = issue.path.length ? issue.path.map(String).join('.') : '(the whole manifest)';
      problems.add('manifest-invalid', `${MANIFEST_NAME}: ${where}: ${issue.message}`, MANIFEST_NAME);
    }
    return null;
  }
  const listed = new Set<string>();
  let twice = false;
  for (const file of parsed.data.files) {
    if (listed.has(file.path)) {
      problems.add('manifest-invalid', `${MANIFEST_NAME}: files: "${file.path}" is listed more than once`, MANIFEST_NAME);
      twice = true;
    }
    listed.add(file.path);
  }
  return twice ? null : parsed.data;
}

/** Every file in the archive listed, every listed file present, with the listed size and hash. */
export function compareWithManifest(manifest: ArchiveManifest, files: ReadonlyMap<string, SeenFile>, refused: ReadonlySet<string>, problems: ProblemList): void {
  const listed = new Map(manifest.files.map((file) => [file.path, file]));
  for (const [path, seen] of files) {
    if (path === MANIFEST_NAME) continue;
    if (!listed.has(path)) problems.add('file-not-in-manifest', `"${path}" is in the archive but not in ${MANIFEST_NAME}`, path);
  }
  for (const file of manifest.files) {
    const seen = files.get(file.path);
    if (!seen) {
      if (!refused.has(file.path)) problems.add('file-missing', `"${file.path}" is listed in ${MANIFEST_NAME} but is not in the archive`, file.path);
    } else if (seen.sizeBytes !== file.sizeBytes) {
      problems.add('file-size-mismatch', `"${file.path}" has ${seen.sizeBytes.toLocaleString('en')} bytes; ${MANIFEST_NAME} says ${file.sizeBytes.toLocaleString('en')}`, file.path);
    } else if (seen.sha256 !== file.sha256) {
      problems.add('file-checksum-mismatch', `"${file.path}" has SHA-256 ${seen.sha256}; ${MANIFEST_NAME} says ${file.sha256}`, file.path);
    }
  }
}

/** The manifest against the campaign it is filed under (table rows are checked as they are read). */
export function compareWithCampaign(manifest: ArchiveManifest, campaign: CampaignContext, bounds: SpecBounds, problems: ProblemList): void {
  if (manifest.campaignId !== campaign.id) {
    problems.add('campaign-mismatch', `${MANIFEST_NAME} names campaign ${manifest.campaignId}, but the archive was uploaded to campaign ${campaign.id}`, MANIFEST_NAME);
  }
  for (const runId of manifest.runIds) {
    if (!campaign.runIds.has(runId)) problems.add('run-not-in-campaign', `run ${runId} in ${MANIFEST_NAME} is not a run of this campaign`, MANIFEST_NAME);
  }
  if (manifest.machine !== campaign.machine) {
    problems.add('outside-spec', `${MANIFEST_NAME} names machine ${manifest.machine}; the campaign's allocation is on ${campaign.machine}`, MANIFEST_NAME);
  }
  const { sizes, disorder, energies } = manifest.parameters;
  const parts: string[] = [];
  const strayL = sizes.filter((l) => !sizeInSpec(bounds, l));
  const strayW = disorder.filter((w) => !disorderInSpec(bounds, w));
  const strayE = energies.filter((e) => !energyInSpec(bounds, e));
  if (strayL.length) parts.push(`sizes ${shortList(strayL)} are not among the planned ${shortList(bounds.sizeList)}`);
  if (strayW.length) parts.push(`disorder values ${shortList(strayW)} lie outside ${describeDisorderSpan(bounds)}`);
  if (strayE.length) parts.push(`energies ${shortList(strayE)} are not among the planned ${shortList([...bounds.energies])}`);
  if (parts.length) problems.add('outside-spec', `${MANIFEST_NAME}: parameters outside the campaign's plan: ${parts.join('; ')}`, MANIFEST_NAME);
}
