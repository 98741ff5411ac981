import { z } from 'zod';
import { listQuery, page } from '../lists';

export const INSTITUTION_KINDS = ['member', 'partner'] as const;
export const InstitutionKind = z.enum(INSTITUTION_KINDS);
export type InstitutionKind = z.infer<typeof InstitutionKind>;

/** ISO 3166-1 alpha-2 country code, upper case. */
export const CountryCode = z
  .string()
  .trim()
  .regex(/^[A-Za-z]{2}$/, 'must be a two-letter ISO 3166 country code such as DE or GB')
  .transform((c) => c.toUpperCase());

export const Institution = z
  .object({
    id: z.uuid(),
    name: z.string(),
    kind: InstitutionKind,
    country: z.string().length(2),
    billingEmail: z.email().nullable(),
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'Institution' });
export type Institution = z.infer<typeof Institution>;

/** The editable fields, without defaults: a patch must never fill in what it did not send. */
const InstitutionFields = z.object({
  name: z.string().trim().min(2, 'name needs at least 2 characters').max(200),
  kind: InstitutionKind,
  country: CountryCode,
  billingEmail: z.email('billing e-mail must be an e-mail address').nullable(),
});

export const InstitutionInput = InstitutionFields.extend({ billingEmail: InstitutionFields.shape.billingEmail.default(null) }).meta({
  id: 'InstitutionInput',
});
export type InstitutionInput = z.infer<typeof InstitutionInput>;

export const InstitutionPatch = InstitutionFields.partial().meta({ id: 'InstitutionPatch' });
export type InstitutionPatch = z.infer<typeof InstitutionPatch>;

export const InstitutionListQuery = listQuery(['name', 'kind', 'country', 'createdAt'], {
  q: z.string().trim().max(100).optional(),
  kind: InstitutionKind.optional(),
}, 'name');
export type InstitutionListQuery = z.infer<typeof InstitutionListQuery>;

export const InstitutionPage = page(Institution).meta({ id: 'InstitutionPage' });
