import { z } from 'zod';
import { Role } from './roles';

export const SessionPerson = z.object({
  id: z.uuid(),
  name: z.string(),
  email: z.email(),
  institutionId: z.uuid().nullable(),
  roles: z.array(Role),
});
export type SessionPerson = z.infer<typeof SessionPerson>;

/** What the portal learns at start: who is signed in, and the CSRF token for writes. */
export const SessionInfo = z
  .object({
    signedIn: z.boolean(),
    person: SessionPerson.nullable(),
    csrfToken: z.string(),
    /** The local mail fake's inbox (demo and test stacks), for admins only; null otherwise. */
    mailInboxUrl: z.url().nullable().default(null),
  })
  .meta({ id: 'SessionInfo' });
export type SessionInfo = z.infer<typeof SessionInfo>;

export const SignOutResult = z
  .object({ signedOut: z.literal(true), endSessionUrl: z.url().nullable() })
  .meta({ id: 'SignOutResult' });
export type SignOutResult = z.infer<typeof SignOutResult>;

/** Where the portal may send a person after sign-in: only paths of our own origin. */
export const SafeRedirect = z
  .string()
  .max(500)
  .regex(/^\/(?!\/)[^\s\\]*$/, 'must be a path on this site, starting with a single /');
