import { z } from 'zod';
import { Role } from '../auth/roles';
import { listQuery, page, QueryBoolean } from '../lists';

export const Person = z
  .object({
    id: z.uuid(),
    name: z.string(),
    email: z.email(),
    institutionId: z.uuid().nullable(),
    institutionName: z.string().nullable(),
    active: z.boolean(),
    linked: z.boolean().describe('true once the person has signed in and their identity-provider account is linked'),
    roles: z.array(Role),
    lastSignInAt: z.iso.datetime().nullable(),
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'Person' });
export type Person = z.infer<typeof Person>;

export const PersonInput = z
  .object({
    name: z.string().trim().min(2, 'name needs at least 2 characters').max(200),
    email: z.email('must be an e-mail address').transform((e) => e.toLowerCase()),
    institutionId: z.uuid('choose an institution').nullable().default(null),
    roles: z.array(Role).default([]),
  })
  .meta({ id: 'PersonInput' });
export type PersonInput = z.infer<typeof PersonInput>;

export const PersonPatch = z
  .object({
    name: z.string().trim().min(2, 'name needs at least 2 characters').max(200),
    institutionId: z.uuid('choose an institution').nullable(),
    active: z.boolean(),
  })
  .partial()
  .meta({ id: 'PersonPatch' });
export type PersonPatch = z.infer<typeof PersonPatch>;

export const PersonListQuery = listQuery(['name', 'email', 'institutionName', 'createdAt', 'lastSignInAt'], {
  q: z.string().trim().max(100).optional().describe('matches name or e-mail'),
  role: Role.optional(),
  institutionId: z.uuid().optional(),
  active: QueryBoolean.optional(),
  linked: QueryBoolean.optional().describe('false: people who never signed in'),
}, 'name');
export type PersonListQuery = z.infer<typeof PersonListQuery>;

export const PersonPage = page(Person).meta({ id: 'PersonPage' });

/** A group the signed-in person belongs to, as the profile shows it. */
export const ProfileGroup = z.object({ id: z.uuid(), name: z.string(), isPi: z.boolean() });

export const Profile = z
  .object({
    person: Person,
    groups: z.array(ProfileGroup),
  })
  .meta({ id: 'Profile' });
export type Profile = z.infer<typeof Profile>;
