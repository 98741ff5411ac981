import { fromMilli, runMilliCoreHours, type RunParameters } from '@localis/shared';

/** The parameter lists of a run, each typed as text: "8 12 16" or "16.0, 16.5". */
export type ParameterTexts = Record<keyof RunParameters, string>;

/** What the "Record a run" dialog edits: RunInput's shape with numbers that may be empty and lists as text. */
export interface RunForm {
  externalJobId: string;
  machine: string;
  /** ISO UTC from the native date-time boxes; '' until chosen. */
  startedAt: string;
  endedAt: string;
  cores: number | null;
  /** Empty: the server takes cores x wall-clock. */
  coreHours: number | null;
  codeName: string;
  codeVersion: string;
  parameters: ParameterTexts;
}

export const PARAMETER_FIELDS: readonly { key: keyof RunParameters; label: string; placeholder: string }[] = [
  { key: 'sizes', label: 'Sizes L', placeholder: 'e.g. 8 12 16 24' },
  { key: 'disorder', label: 'Disorder W', placeholder: 'e.g. 16.0, 16.3, 16.6' },
  { key: 'energies', label: 'Energies E', placeholder: 'e.g. 0' },
  { key: 'seeds', label: 'Seeds', placeholder: 'e.g. 1 2 3' },
];

export function runFormOf(machine: string): RunForm {
  return {
    externalJobId: '',
    machine,
    startedAt: '',
    endedAt: '',
    cores: null,
    coreHours: null,
    codeName: '',
    codeVersion: '',
    parameters: { sizes: '', disorder: '', energies: '', seeds: '' },
  };
}

/**
 * Numbers typed as a list, separated by commas, semicolons or spaces. A word that is not a
 * number stays in the list as NaN, so the schema says the list is wrong instead of silently
 * dropping it.
 */
export function parseNumberList(text: string): number[] {
  return text
    .split(/[\s,;]+/)
    .filter((token) => token !== '')
    .map((token) => (/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(token) ? Number(token) : Number.NaN));
}

/** What RunInput checks: empty numbers left out (or as undefined for the required ones), lists parsed. */
export function runInputOf(form: RunForm): Record<string, unknown> {
  return {
    externalJobId: form.externalJobId,
    machine: form.machine,
    startedAt: form.startedAt || undefined,
    endedAt: form.endedAt || undefined,
    cores: form.cores ?? undefined,
    ...(form.coreHours === null ? {} : { coreHours: form.coreHours }),
    codeName: form.codeName,
    codeVersion: form.codeVersion,
    parameters: {
      sizes: parseNumberList(form.parameters.sizes),
      disorder: parseNumberList(form.parameters.disorder),
      energies: parseNumberList(form.parameters.energies),
      seeds: parseNumberList(form.parameters.seeds),
    },
  };
}

/**
 * Cores x wall-clock in core-hours (to the milli-core-hour, as the ledger counts), or null while
 * the cores or times are missing or the run would end before it starts.
 */
export function wallClockCoreHours(form: Pick<RunForm, 'cores' | 'startedAt' | 'endedAt'>): number | null {
  if (!form.cores || form.cores <= 0 || !form.startedAt || !form.endedAt) return null;
  const start = new Date(form.startedAt).getTime();
  const end = new Date(form.endedAt).getTime();
  if (!Number.isFinite(start) || !Number.isFinite(end) || end <= start) return null;
  return fromMilli(runMilliCoreHours(form.cores, form.startedAt, form.endedAt));
}

/** The wall-clock of a run as "2 d 3 h 5 min", "45 min", for the line under the times. */
export function formatWallClock(startedAt: string, endedAt: string): string {
  const minutes = Math.round((new Date(endedAt).getTime() - new Date(startedAt).getTime()) / 60_000);
  if (!Number.isFinite(minutes) || minutes <= 0) return '';
  const days = Math.floor(minutes / 1440);
  const hours = Math.floor((minutes % 1440) / 60);
  const rest = minutes % 60;
  return [days ? `${days} d` : '', hours ? `${hours} h` : '', rest || (!days && !hours) ? `${rest} min` : ''].filter(Boolean).join(' ');
}
