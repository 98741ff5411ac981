import { z } from 'zod';
import { listQuery, page } from '../lists';
import { MachineName } from '../rounds/round.schema';

const finiteList = (label: string, item: z.ZodType<number>) => z.array(item).max(100_000, `at most 100 000 ${label}`).default([]);

/** What a run covered; each list may be empty when it does not apply. */
export const RunParameters = z
  .object({
    sizes: finiteList('sizes', z.number().int('sizes are whole numbers').min(1, 'sizes are at least 1')),
    disorder: finiteList('disorder values', z.number().refine(Number.isFinite, 'disorder values must be finite').refine((w) => w >= 0, 'disorder is not negative')),
    energies: finiteList('energies', z.number().refine(Number.isFinite, 'energies must be finite')),
    seeds: finiteList('seeds', z.number().int('seeds are whole numbers').min(0, 'seeds are not negative')),
  })
  .strict()
  .meta({ id: 'RunParameters' });
export type RunParameters = z.infer<typeof RunParameters>;

export const MAX_RUN_CORES = 10_000_000;

const RunFields = z.object({
  externalJobId: z.string().trim().min(1, "give the scheduler's job id").max(100, 'a job id may have at most 100 characters'),
  machine: MachineName,
  startedAt: z.iso.datetime({ offset: true, message: 'startedAt must be a date and time, e.g. 2027-02-01T08:00:00Z' }),
  endedAt: z.iso.datetime({ offset: true, message: 'endedAt must be a date and time, e.g. 2027-02-01T20:00:00Z' }),
  cores: z.number({ message: 'cores must be a number' }).int('cores is a whole number').min(1, 'a run uses at least 1 core').max(MAX_RUN_CORES, `at most ${MAX_RUN_CORES} cores`),
  /** Left out: cores x wall-clock hours. */
  coreHours: z
    .number({ message: 'coreHours must be a number' })
    .refine(Number.isFinite, 'coreHours must be finite')
    .refine((v) => v >= 0.001, 'coreHours must be at least 0.001 (3.6 core-seconds)')
    .refine((v) => Math.abs(v * 1000 - Math.round(v * 1000)) < 1e-6, 'coreHours have at most three decimals')
    .refine((v) => v <= 1e12, 'that is more core-hours than Localis accepts (10^12)')
    .optional(),
  codeName: z.string().trim().min(1, 'name the code that ran').max(100),
  codeVersion: z.string().trim().min(1, "give the code's version or commit").max(100),
  parameters: RunParameters.default({ sizes: [], disorder: [], energies: [], seeds: [] }),
});

/** A run must end after it starts. */
export function checkRunTimes(r: { startedAt?: string; endedAt?: string }, ctx: z.RefinementCtx) {
  if (r.startedAt && r.endedAt && new Date(r.endedAt) <= new Date(r.startedAt)) {
    ctx.addIssue({ code: 'custom', path: ['endedAt'], message: 'a run must end after it starts' });
  }
}

/** A run as people, the CLI and scripts record it. Creating one debits the campaign's grant. */
export const RunInput = RunFields.strict().superRefine(checkRunTimes).meta({ id: 'RunInput' });
export type RunInput = z.infer<typeof RunInput>;
export type RunInputRaw = z.input<typeof RunInput>;

export const RUN_SOURCES = ['portal', 'api', 'import'] as const;

export const Run = RunFields.extend({
  id: z.uuid(),
  campaignId: z.uuid(),
  coreHours: z.number(),
  /** Core-hours given back by refunds of this run. */
  refundedCoreHours: z.number(),
  source: z.enum(RUN_SOURCES),
  recordedByName: z.string().nullable(),
  createdAt: z.iso.datetime(),
}).meta({ id: 'Run' });
export type Run = z.infer<typeof Run>;

export const RunListQuery = listQuery(['startedAt', 'endedAt', 'coreHours', 'cores', 'externalJobId', 'createdAt'], {
  q: z.string().trim().max(100).optional(),
  codeName: z.string().trim().max(100).optional(),
  from: z.iso.datetime({ offset: true, message: 'from must be a date and time' }).optional(),
  to: z.iso.datetime({ offset: true, message: 'to must be a date and time' }).optional(),
}, '-startedAt');
export type RunListQuery = z.infer<typeof RunListQuery>;

export const RunPage = page(Run).meta({ id: 'RunPage' });
