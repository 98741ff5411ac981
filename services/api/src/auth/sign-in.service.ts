import { z } from 'zod';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { auditService } from '../audit/audit.service';
import { peopleRepository } from '../people/people.repository';

/** The identity-provider claims Localis relies on. */
export const IdentityClaims = z.object({
  sub: z.string().min(1),
  email: z.email().transform((e) => e.toLowerCase()),
  email_verified: z.boolean().optional(),
  name: z.string().optional(),
});
export type IdentityClaims = z.infer<typeof IdentityClaims>;

export type SignInOutcome =
  | { kind: 'signed-in'; personId: string }
  | { kind: 'not-a-member'; email: string }
  | { kind: 'inactive'; email: string };

export function createSignInService(db: Database) {
  return {
    /**
     * Match the provider's account to a person: by subject once linked; the first time by an
     * e-mail the office entered, and only when the provider says it verified that address,
     * which links the two for good (else anyone registering that address could take it over).
     */
    async signIn(claims: IdentityClaims, ctx: RequestContext): Promise<SignInOutcome> {
      return db.transaction(async (tx) => {
        let person = await peopleRepository.findRecord({ oidcSubject: claims.sub }, tx);
        let linkedNow = false;
        if (!person && claims.email_verified === true) {
          const byEmail = await peopleRepository.findRecord({ email: claims.email }, tx);
          if (byEmail && byEmail.oidcSubject === null) {
            await peopleRepository.linkSubject(byEmail.id, claims.sub, tx);
            person = byEmail;
            linkedNow = true;
          }
        }
        if (!person) return { kind: 'not-a-member', email: claims.email };
        const actor: RequestContext = {
          ...ctx,
          principal: { personId: person.id, name: person.name, email: person.email, institutionId: person.institutionId, roles: person.roles, scopes: [], via: 'session' },
        };
        if (!person.active) {
          await auditService.record(actor, 'session.refused-inactive', { type: 'person', id: person.id }, {}, tx);
          return { kind: 'inactive', email: person.email };
        }
        if (linkedNow) await auditService.record(actor, 'person.linked', { type: 'person', id: person.id }, { subject: claims.sub }, tx);
        await peopleRepository.touchSignIn(person.id, tx);
        await auditService.record(actor, 'session.signed-in', { type: 'person', id: person.id }, {}, tx);
        return { kind: 'signed-in', personId: person.id };
      });
    },

    /** Written before the session ends, so the entry still knows who signed out. */
    async signOut(ctx: RequestContext): Promise<void> {
      if (ctx.principal) await auditService.record(ctx, 'session.signed-out', { type: 'person', id: ctx.principal.personId });
    },
  };
}
export type SignInService = ReturnType<typeof createSignInService>;
