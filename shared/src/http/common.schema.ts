import { z } from 'zod';

export const IdParams = z.object({ id: z.uuid('the id in the address is not a valid UUID') });
export type IdParams = z.infer<typeof IdParams>;

export const Health = z.object({ status: z.literal('ok') });
export const Readiness = z.object({
  status: z.enum(['ready', 'not-ready']),
  checks: z.record(z.string(), z.object({ ok: z.boolean(), ms: z.number(), error: z.string().optional() })),
});
