import { randomUUID } from 'node:crypto';
import { CampaignInput, TOKEN_SCOPES, type Role } from '@localis/shared';
import type { RequestContext } from '../src/http/principal';
import { createInstitution, createPerson, SYSTEM, tokenFor, type TestApp } from './harness';

type TestPerson = Awaited<ReturnType<typeof createPerson>>;

/** A person acting through the services as a signed-in session would. */
export const actingAs = (p: { id: string; name: string; email: string; institutionId: string | null; roles: Role[] }): RequestContext => ({
  ...SYSTEM,
  principal: { personId: p.id, name: p.name, email: p.email, institutionId: p.institutionId, roles: p.roles, scopes: [...TOKEN_SCOPES], via: 'session' },
});

/** A large 3D transfer-matrix plan, so partial grants of any test size are below the request. */
export const LARGE_SPEC = {
  model: 'anderson-box', dimension: 3, symmetryClass: 'AI', sizes: [8, 12, 16, 20, 24], disorder: { from: 15, to: 18, step: 0.25 },
  energies: [0], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.0001, node: { coresPerNode: 64, memoryGiBPerNode: 256 },
};

export interface CampaignWorld {
  machine: string;
  roundId: string;
  groupId: string;
  otherGroupId: string;
  institutionId: string;
  pi: TestPerson;
  researcher: TestPerson;
  admin: TestPerson;
  /** A committee member from another institution. */
  reviewer: TestPerson;
  /** A committee member from the proposers' own institution (a conflict of interest). */
  sameInstitutionReviewer: TestPerson;
  outsider: TestPerson;
  tokens: Record<'pi' | 'researcher' | 'admin' | 'reviewer' | 'outsider', string>;
  submitted(title?: string): Promise<string>;
  /** A campaign granted `coreHours` (a partial grant of a larger request). */
  granted(coreHours: number, opts?: { title?: string }): Promise<string>;
}

/**
 * One research group with a PI and a researcher, the office, two committee members, and a
 * round with a pool on its own machine: the records review, ledger and runs tests start from.
 */
export async function makeCampaignWorld(t: TestApp, opts: { poolCoreHours?: number; overdraftPercent?: number; label?: string; institutionKind?: 'member' | 'partner' } = {}): Promise<CampaignWorld> {
  const label = opts.label ?? 'world';
  const machine = `${label}-${randomUUID().slice(0, 6)}`;
  const inst = await createInstitution(t, opts.institutionKind ?? 'member');
  const otherInst = await createInstitution(t);
  const pi = await createPerson(t, { roles: ['pi', 'researcher'], institutionId: inst.id, label: `${label}-pi` });
  const researcher = await createPerson(t, { roles: ['researcher'], institutionId: inst.id, label: `${label}-researcher` });
  const admin = await createPerson(t, { roles: ['admin'], institutionId: otherInst.id, label: `${label}-admin` });
  const reviewer = await createPerson(t, { roles: ['committee'], institutionId: otherInst.id, label: `${label}-reviewer` });
  const sameInstitutionReviewer = await createPerson(t, { roles: ['committee'], institutionId: inst.id, label: `${label}-colleague` });
  const outsider = await createPerson(t, { roles: ['pi', 'researcher'], institutionId: otherInst.id, label: `${label}-outsider` });
  const groupId = (await t.services.groups.create(SYSTEM, { name: `Group ${machine}`, institutionId: inst.id, piPersonId: pi.id })).id;
  const otherGroupId = (await t.services.groups.create(SYSTEM, { name: `Other ${machine}`, institutionId: otherInst.id, piPersonId: outsider.id })).id;
  await t.services.groups.addMember(actingAs(pi), groupId, researcher.id);
  const day = 86_400_000;
  const roundId = (
    await t.services.rounds.create(actingAs(admin), {
      name: `Round ${machine}`, opensAt: new Date(Date.now() - day).toISOString(), closesAt: new Date(Date.now() + 30 * day).toISOString(),
      pools: [{ machine, coreHours: opts.poolCoreHours ?? 10_000_000 }], overdraftPercent: opts.overdraftPercent ?? 0,
    })
  ).id;
  const [piT, researcherT, adminT, reviewerT, outsiderT] = await Promise.all([pi, researcher, admin, reviewer, outsider].map((p) => tokenFor(t, p)));
  const submitted = async (title = 'A campaign of the test world') => {
    const input = CampaignInput.parse({ title, abstract: 'Transfer-matrix study of the orthogonal class around W = 16.5.', groupId, roundId, machine, spec: LARGE_SPEC });
    const draft = await t.services.campaigns.create(actingAs(researcher), input);
    return (await t.services.campaigns.submit(actingAs(pi), draft.id)).id;
  };
  return {
    machine, roundId, groupId, otherGroupId, institutionId: inst.id, pi, researcher, admin, reviewer, sameInstitutionReviewer, outsider,
    tokens: { pi: piT, researcher: researcherT, admin: adminT, reviewer: reviewerT, outsider: outsiderT },
    submitted,
    async granted(coreHours, o = {}) {
      const id = await submitted(o.title);
      await t.services.reviews.decide(actingAs(admin), id, { outcome: 'grant-part', coreHours, message: 'Granted in part for the test.' });
      return id;
    },
  };
}
