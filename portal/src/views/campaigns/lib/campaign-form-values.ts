import { PilotSettings, type Campaign, type CampaignInput, type CampaignPatch, type CampaignSpec, type Goal, type Method, type Model, type PilotTiming, type SymmetryClass } from '@localis/shared';

/**
 * What the campaign form's inputs edit. Numbers and lists are the text the person typed, so a
 * half-typed "15." or "8, 12, x" stays on screen and the shared schema says what is wrong with it;
 * `toCampaignInput` turns the text into the shape the schema (and the api) check.
 */
export interface SpecFormValues {
  model: Model;
  dimension: 1 | 2 | 3;
  symmetryClass: SymmetryClass;
  goal: Goal;
  sizes: string;
  disorder: { mode: DisorderMode; from: string; to: string; step: string; values: string };
  energies: string;
  realizations: string;
  method: Method;
  targetPrecision: string;
  methodOptions: { expectedLambda: string; reorthogonalizeEvery: string; moments: string; randomVectors: string; eigenpairs: string };
  node: { coresPerNode: string; memoryGiBPerNode: string };
  pilotTimings: PilotTiming[];
  /** The settings the pilots ran with, captured when they were read in. */
  pilotSettings: PilotSettings | null;
}

export type DisorderMode = 'range' | 'values';

export interface CampaignFormValues {
  title: string;
  abstract: string;
  justification: string;
  groupId: string | null;
  roundId: string | null;
  machine: string | null;
  spec: SpecFormValues;
}

/** The words for empty or non-numeric fields whose schema has no message of its own. */
export const TYPE_MESSAGES = {
  blank: 'fill this in',
  notANumber: 'must be a number',
  blankByField: { machine: "choose the machine, from the round's pools" },
};

/** Options each method reads; the others are not sent, so a switch of method leaves nothing stale behind. */
export const METHOD_OPTION_FIELDS: Record<Method, (keyof SpecFormValues['methodOptions'])[]> = {
  'transfer-matrix': ['expectedLambda', 'reorthogonalizeEvery'],
  'kernel-polynomial': ['moments', 'randomVectors'],
  'shift-invert': ['eigenpairs'],
  'exact-diagonalization': [],
  'recursive-green': [],
};

/** A number from a text box: empty is "not given", a Unicode minus is a minus, junk is NaN (the schema names it). */
export function parseNumber(text: string): number | undefined {
  const trimmed = text.trim().replace(/^[−–]/, '-');
  if (trimmed === '') return undefined;
  return Number(trimmed);
}

/** "8, 12 16;24" -> [8, 12, 16, 24]; anything that is not a number stays as NaN for the schema to report. */
export function parseList(text: string): number[] {
  return text
    .split(/[\s,;]+/)
    .filter((token) => token !== '')
    .map((token) => parseNumber(token) ?? Number.NaN);
}

const text = (n: number | undefined) => (n === undefined ? '' : String(n));
const list = (ns: readonly number[]) => ns.map(String).join(', ');

export function toSpecInput(v: SpecFormValues): unknown {
  const options: Record<string, number | undefined> = {};
  for (const key of METHOD_OPTION_FIELDS[v.method]) {
    const value = parseNumber(v.methodOptions[key]);
    if (value !== undefined) options[key] = value;
  }
  return {
    model: v.model,
    dimension: v.dimension,
    symmetryClass: v.symmetryClass,
    goal: v.goal,
    sizes: parseList(v.sizes),
    disorder:
      v.disorder.mode === 'values'
        ? { values: parseList(v.disorder.values) }
        : { from: parseNumber(v.disorder.from), to: parseNumber(v.disorder.to), step: parseNumber(v.disorder.step) },
    energies: parseList(v.energies),
    realizations: parseNumber(v.realizations),
    method: v.method,
    targetPrecision: v.method === 'transfer-matrix' ? parseNumber(v.targetPrecision) : undefined,
    methodOptions: options,
    node: { coresPerNode: parseNumber(v.node.coresPerNode), memoryGiBPerNode: parseNumber(v.node.memoryGiBPerNode) },
    pilotTimings: v.pilotTimings.length > 0 ? v.pilotTimings : undefined,
    pilotSettings: v.pilotTimings.length > 0 && v.pilotSettings ? v.pilotSettings : undefined,
  };
}

/**
 * The plan's settings as they stand, to keep with pilot timings read in now: if the plan's
 * precision or options change later, the estimate scales the pilots by the ratio of operations.
 */
export function pilotSettingsOf(v: SpecFormValues): PilotSettings | null {
  const input = toSpecInput(v) as { targetPrecision?: number; methodOptions?: Record<string, number | undefined> };
  const eps = input.targetPrecision;
  const options = Object.fromEntries(Object.entries(input.methodOptions ?? {}).filter(([, x]) => typeof x === 'number' && Number.isFinite(x)));
  const parsed = PilotSettings.safeParse({
    method: v.method,
    symmetryClass: v.symmetryClass,
    ...(typeof eps === 'number' && Number.isFinite(eps) ? { targetPrecision: eps } : {}),
    methodOptions: options,
  });
  return parsed.success ? parsed.data : { method: v.method, symmetryClass: v.symmetryClass };
}

/** The form's values in the shape `CampaignInput` parses (not yet checked). */
export function toCampaignInput(v: CampaignFormValues): unknown {
  return {
    title: v.title,
    abstract: v.abstract,
    justification: v.justification,
    groupId: v.groupId ?? undefined,
    roundId: v.roundId ?? undefined,
    machine: v.machine ?? undefined,
    spec: toSpecInput(v.spec),
  };
}

/** A draft's changes: everything the form edits except the group, which a draft keeps. */
export function toCampaignPatch(input: CampaignInput): CampaignPatch {
  const { groupId: _group, ...patch } = input;
  return patch;
}

export function specFormValues(spec: CampaignSpec): SpecFormValues {
  const o = spec.methodOptions ?? {};
  return {
    model: spec.model,
    dimension: spec.dimension,
    symmetryClass: spec.symmetryClass,
    goal: spec.goal,
    sizes: list(spec.sizes),
    disorder: spec.disorder.values
      ? { mode: 'values', from: '', to: '', step: '', values: list(spec.disorder.values) }
      : { mode: 'range', from: text(spec.disorder.from), to: text(spec.disorder.to), step: text(spec.disorder.step), values: '' },
    energies: list(spec.energies),
    realizations: String(spec.realizations),
    method: spec.method,
    targetPrecision: text(spec.targetPrecision),
    methodOptions: {
      expectedLambda: text(o.expectedLambda),
      reorthogonalizeEvery: text(o.reorthogonalizeEvery),
      moments: text(o.moments),
      randomVectors: text(o.randomVectors),
      eigenpairs: text(o.eigenpairs),
    },
    node: { coresPerNode: String(spec.node.coresPerNode), memoryGiBPerNode: String(spec.node.memoryGiBPerNode) },
    pilotTimings: spec.pilotTimings ? spec.pilotTimings.map((t) => ({ ...t })) : [],
    pilotSettings: spec.pilotSettings ?? null,
  };
}

export function campaignFormValues(c: Campaign): CampaignFormValues {
  return {
    title: c.title,
    abstract: c.abstract,
    justification: c.justification,
    groupId: c.groupId,
    roundId: c.roundId,
    machine: c.machine,
    spec: specFormValues(c.spec),
  };
}

/**
 * A new proposal starts from a typical plan (3D orthogonal Anderson model at the band centre,
 * transfer matrix), so the estimate and the notices show from the first moment; the science
 * case, group and round are the proposer's to fill in.
 */
export function newCampaignValues(): CampaignFormValues {
  return {
    title: '',
    abstract: '',
    justification: '',
    groupId: null,
    roundId: null,
    machine: null,
    spec: {
      model: 'anderson-box',
      dimension: 3,
      symmetryClass: 'AI',
      goal: 'critical-point',
      sizes: '6, 8, 12, 16',
      disorder: { mode: 'range', from: '15', to: '18', step: '0.25', values: '' },
      energies: '0',
      realizations: '1',
      method: 'transfer-matrix',
      targetPrecision: '0.005',
      methodOptions: { expectedLambda: '', reorthogonalizeEvery: '', moments: '', randomVectors: '', eigenpairs: '' },
      node: { coresPerNode: '64', memoryGiBPerNode: '256' },
      pilotTimings: [],
      pilotSettings: null,
    },
  };
}
