import type { DisorderMode } from './campaign-form-values';

/**
 * Each field of the campaign form: the key its errors come under (the schema's path, see
 * `errorKey`), the id of its input (also its data-testid) and its label in the error summary.
 */
export const CAMPAIGN_FIELDS = {
  title: { id: 'campaign-title', label: 'Title' },
  abstract: { id: 'campaign-abstract', label: 'Abstract' },
  justification: { id: 'campaign-justification', label: 'Justification' },
  groupId: { id: 'campaign-group', label: 'Research group' },
  roundId: { id: 'campaign-round', label: 'Allocation round' },
  machine: { id: 'campaign-machine', label: 'Machine' },
  'spec.model': { id: 'spec-model', label: 'Model' },
  'spec.dimension': { id: 'spec-dimension', label: 'Dimension d' },
  'spec.symmetryClass': { id: 'spec-symmetry-class', label: 'Symmetry class' },
  'spec.goal': { id: 'spec-goal', label: 'Aim' },
  'spec.sizes': { id: 'spec-sizes', label: 'System sizes L' },
  'spec.disorder': { id: 'disorder-from', label: 'Disorder W' },
  'spec.disorder.from': { id: 'disorder-from', label: 'Disorder W from' },
  'spec.disorder.to': { id: 'disorder-to', label: 'Disorder W to' },
  'spec.disorder.step': { id: 'disorder-step', label: 'Disorder W step' },
  'spec.disorder.values': { id: 'disorder-values', label: 'Disorder values W' },
  'spec.energies': { id: 'spec-energies', label: 'Energies E' },
  'spec.realizations': { id: 'spec-realizations', label: 'Realizations' },
  'spec.method': { id: 'spec-method', label: 'Method' },
  'spec.targetPrecision': { id: 'spec-target-precision', label: 'Target precision ε' },
  'spec.methodOptions.expectedLambda': { id: 'spec-expected-lambda', label: 'Expected Λ' },
  'spec.methodOptions.reorthogonalizeEvery': { id: 'spec-reorthogonalize-every', label: 'Re-orthonormalize every' },
  'spec.methodOptions.moments': { id: 'spec-moments', label: 'Chebyshev moments' },
  'spec.methodOptions.randomVectors': { id: 'spec-random-vectors', label: 'Random vectors' },
  'spec.methodOptions.eigenpairs': { id: 'spec-eigenpairs', label: 'Eigenpairs per job' },
  'spec.node.coresPerNode': { id: 'node-cores', label: 'Cores per node' },
  'spec.node.memoryGiBPerNode': { id: 'node-memory', label: 'Memory per node' },
  'spec.pilotTimings': { id: 'pilot-csv', label: 'Pilot timings' },
} as const satisfies Record<string, { id: string; label: string }>;

export type CampaignFieldKey = keyof typeof CAMPAIGN_FIELDS;

/** The input to move to for an error key; unknown keys (a newer server) go to the top of the form. */
export function fieldIdOf(key: string, disorderMode: DisorderMode = 'range'): string | null {
  if (key === 'spec.disorder' && disorderMode === 'values') return CAMPAIGN_FIELDS['spec.disorder.values'].id;
  return key in CAMPAIGN_FIELDS ? CAMPAIGN_FIELDS[key as CampaignFieldKey].id : null;
}

/** The errors as the summary above the form lists them, in the order of the form. */
export function errorSummary(errors: Record<string, string>, disorderMode: DisorderMode = 'range') {
  const order = Object.keys(CAMPAIGN_FIELDS);
  const rank = (key: string) => (order.includes(key) ? order.indexOf(key) : -1);
  return Object.entries(errors)
    .sort(([a], [b]) => rank(a) - rank(b))
    .map(([key, message]) => ({
      key,
      message,
      label: key in CAMPAIGN_FIELDS ? CAMPAIGN_FIELDS[key as CampaignFieldKey].label : key === '_form' ? 'Campaign' : key,
      fieldId: fieldIdOf(key, disorderMode),
    }));
}

/** A notice's `field` (a spec key) as the input it is about. */
export function noticeFieldId(field: string | undefined, disorderMode: DisorderMode = 'range'): string | null {
  return field ? fieldIdOf(`spec.${field}`, disorderMode) : null;
}

/** Moves the keyboard (and the view) to an input; PrimeVue selects take focus on their inner element. */
export function focusField(id: string): void {
  const el = document.getElementById(id);
  if (!el) return;
  el.scrollIntoView?.({ block: 'center', behavior: 'smooth' });
  const target = el.matches('input, textarea, button, [tabindex]') ? el : el.querySelector<HTMLElement>('input, textarea, button, [tabindex]');
  (target ?? el).focus({ preventScroll: true });
}
