import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BrowserSession, createInstitution, createPerson, startTestApp, SYSTEM, tokenFor, withToken, type TestApp } from '../../test/harness';
import { ACTORS, MATRIX, MATRIX_MACHINE, MATRIX_SPEC, type Actor, type Fixtures } from './authorization-matrix';
import type { RequestContext } from './principal';
import { randomUUID } from 'node:crypto';
import { CampaignInput, RunInput, TOKEN_SCOPES } from '@localis/shared';
import { fullPath } from './route-registry';
import { InvoiceRow, InvoiceRunRow } from '../db/models';

let t: TestApp;
let fixtures: Fixtures;
/** The admin's API tokens: one that may only read, one with every scope. */
let adminReadToken: string;
let adminFullToken: string;
const emails = new Map<Actor, string>();
const sessions = new Map<Actor, BrowserSession>();

beforeAll(async () => {
  t = await startTestApp();
  const instA = await createInstitution(t);
  const instB = await createInstitution(t);
  const partner = await createInstitution(t, 'partner');
  const researcher = await createPerson(t, { roles: ['researcher'], institutionId: instA.id, label: 'researcher' });
  const pi = await createPerson(t, { roles: ['pi', 'researcher'], institutionId: instA.id, label: 'pi' });
  const committee = await createPerson(t, { roles: ['committee'], institutionId: instB.id, label: 'committee' });
  const admin = await createPerson(t, { roles: ['admin'], institutionId: instB.id, label: 'admin' });
  const billing = await createPerson(t, { roles: ['billing'], institutionId: partner.id, label: 'billing' });
  const otherPi = await createPerson(t, { roles: ['pi', 'researcher'], institutionId: instB.id, label: 'otherpi' });
  const extra = await createPerson(t, { roles: ['researcher'], institutionId: instA.id, label: 'extra' });
  const groupA = await t.services.groups.create(SYSTEM, { name: 'Matrix Group A', institutionId: instA.id, piPersonId: pi.id });
  await t.services.groups.addMember({ ...SYSTEM, principal: { personId: pi.id, name: pi.name, email: pi.email, institutionId: instA.id, roles: pi.roles, scopes: [], via: 'session' } }, groupA.id, researcher.id);
  await t.services.groups.create(SYSTEM, { name: 'Matrix Group B', institutionId: instB.id, piPersonId: otherPi.id });
  adminReadToken = await tokenFor(t, admin, ['read']);
  adminFullToken = await tokenFor(t, admin);
  const byActor: Record<Exclude<Actor, 'anonymous'>, typeof researcher> = { researcher, pi, committee, admin, billing, otherGroupPi: otherPi };
  for (const [actor, person] of Object.entries(byActor)) emails.set(actor as Actor, person.email);
  await Promise.all(
    ACTORS.map(async (actor) => {
      const session = new BrowserSession(t.url);
      if (actor === 'anonymous') await session.refreshSession();
      else await session.signIn(emails.get(actor)!);
      sessions.set(actor, session);
    }),
  );
  const as = (p: typeof researcher): RequestContext => ({ ...SYSTEM, principal: { personId: p.id, name: p.name, email: p.email, institutionId: p.institutionId, roles: p.roles, scopes: ['read', 'write'], via: 'session' } });
  const round = await t.services.rounds.create(as(admin), {
    name: `Matrix round ${Date.now()}`, opensAt: new Date(Date.now() - 86_400_000).toISOString(), closesAt: new Date(Date.now() + 30 * 86_400_000).toISOString(),
    pools: [{ machine: MATRIX_MACHINE, coreHours: 1_000_000 }],
  });
  const draftInput = CampaignInput.parse({ title: 'Matrix draft', abstract: 'A draft the authorization matrix reads and changes.', groupId: groupA.id, roundId: round.id, machine: MATRIX_MACHINE, spec: MATRIX_SPEC });
  const freshDraft = async () => (await t.services.campaigns.create(as(researcher), draftInput)).id;
  const freshSubmitted = async () => (await t.services.campaigns.submit(as(pi), await freshDraft())).id;
  const asAdmin: RequestContext = { ...SYSTEM, principal: { personId: admin.id, name: admin.name, email: admin.email, institutionId: admin.institutionId, roles: ['admin'], scopes: [...TOKEN_SCOPES], via: 'session' } };
  const freshGranted = async () => {
    const id = await freshSubmitted();
    await t.services.reviews.decide(asAdmin, id, { outcome: 'grant-all', message: 'Granted for the authorization matrix.' });
    await t.services.ledger.adjust(asAdmin, id, { coreHours: 100, reason: 'headroom for the matrix runs' });
    return id;
  };
  const grantedId = await freshGranted();
  fixtures = {
    committeeId: committee.id,
    grantedId,
    freshGranted,
    async freshAssignment() {
      const campaignId = await freshSubmitted();
      const a = await t.services.reviews.assign(asAdmin, campaignId, committee.id);
      return { campaignId, assignmentId: a.id };
    },
    async freshRun() {
      const run = await t.services.runs.create(as(pi), grantedId, RunInput.parse({
        externalJobId: `matrix-refund-${randomUUID()}`, machine: MATRIX_MACHINE, startedAt: '2027-02-01T08:00:00Z', endedAt: '2027-02-01T08:00:36Z', cores: 1, codeName: 'tmm-bar', codeVersion: 'matrix',
      }));
      return run.id;
    },
    scratch: {},
    uploadingArchiveId: (await t.services.archives.create(as(pi), grantedId, { kind: 'results', fileName: 'matrix-read.tar.gz', sizeBytes: 20_000_000, runIds: [] })).archive.id,
    analysisId: (await t.services.analyses.request(as(pi), grantedId, { bootstrap: 0 })).id,
    freshUploadingArchive: async () => (await t.services.archives.create(as(pi), grantedId, { kind: 'results', fileName: 'matrix-cancel.tar.gz', sizeBytes: 20_000_000, runIds: [] })).archive.id,
    latestTreeSize: async () => (await t.services.provenance.latestHead()).treeSize,
    roundId: round.id,
    draftId: await freshDraft(),
    submittedId: await freshSubmitted(),
    freshDraft,
    freshSubmitted,
    institutionA: instA.id,
    partnerId: partner.id,
    invoiceId: await draftInvoice(partner.id),
    freshDraftInvoice: () => draftInvoice(partner.id),
    issuedInvoiceId: (await t.services.invoices.issue(as(admin), await draftInvoice(partner.id))).id,
    closeInvoiceRuns: async () => {
      await InvoiceRunRow.update({ state: 'failed', error: 'closed by the matrix', finishedAt: new Date() }, { where: { state: ['queued', 'running'] } });
    },
    groupA: groupA.id,
    researcherId: researcher.id,
    piId: pi.id,
    extraId: extra.id,
    async tokenIdOf(actor) {
      const res = await sessions.get(actor)!.api('POST', '/api/v1/me/tokens', { name: 'to revoke', scopes: ['read'], expiresInDays: 1 });
      return ((await res.json()) as { token: { id: string } }).token.id;
    },
    async addExtraToGroupA() {
      await t.services.groups.addMember({ ...SYSTEM, principal: { personId: admin.id, name: admin.name, email: admin.email, institutionId: null, roles: ['admin'], scopes: [], via: 'session' } }, groupA.id, extra.id);
    },
  };
}, 120_000);
afterAll(async () => t.close());

describe('authorization matrix', () => {
  describe('coverage', () => {
    it('should list every route of the app when a route is added', () => {
      const registered = t.routes.map((r) => `${r.method.toUpperCase()} ${fullPath(r)}`).sort();
      const listed = MATRIX.map((r) => `${r.method} ${r.route}`).sort();
      expect(registered.filter((r) => !listed.includes(r)), 'routes missing from the matrix').toEqual([]);
      expect(listed.filter((r) => !registered.includes(r)), 'matrix rows without a route').toEqual([]);
    });
  });

  describe('statuses', () => {
    it.each(MATRIX.map((row) => [`${row.method} ${row.route}`, row] as const))('should answer %s as the table says for every caller', async (_name, row) => {
      const got: Record<string, number> = {};
      for (const actor of ACTORS) {
        if (row.before) await row.before(fixtures);
        let session = sessions.get(actor)!;
        if (row.freshSession && actor !== 'anonymous') {
          session = new BrowserSession(t.url);
          await session.signIn(emails.get(actor)!);
        }
        const path = await row.path(fixtures, actor);
        const res = await session.api(row.method, path, row.body?.(fixtures));
        got[actor] = res.status;
      }
      expect(got).toEqual(row.expect);
    });
  });

  describe('API token scopes', () => {
    const asAdminWith = async (token: string, row: (typeof MATRIX)[number]) => {
      if (row.before) await row.before(fixtures);
      return withToken(t, token, row.method, await row.path(fixtures, 'admin'), row.body?.(fixtures));
    };
    const viaToken = MATRIX.filter((row) => !row.freshSession && row.expect.anonymous !== row.expect.admin);
    it.each(viaToken.map((row) => [`${row.method} ${row.route}`, row] as const))(
      "should answer %s with an admin's read-only token as the admin for reads and 403 for writes",
      async (_name, row) => {
        const res = await asAdminWith(adminReadToken, row);
        expect(res.status).toBe(row.method === 'GET' || row.readOnly ? row.expect.admin : 403);
      },
    );

    it.each(viaToken.filter((r) => r.method !== 'GET').map((row) => [`${row.method} ${row.route}`, row] as const))(
      "should answer %s with an admin's full token as the admin in the browser",
      async (_name, row) => {
        const res = await asAdminWith(adminFullToken, row);
        // Tokens cannot make tokens; everything else behaves as in the browser.
        expect(res.status).toBe(row.route === '/api/v1/me/tokens' ? 403 : row.expect.admin);
      },
    );
  });
});

/** A draft invoice of EUR 1.21 (one line, 21 % VAT), as an invoice run would make it. */
async function draftInvoice(institutionId: string): Promise<string> {
  const card = { currency: 'EUR', unitPriceMinor: 10, tiers: [], discountBasisPoints: 0, taxRateBasisPoints: 2100, reverseCharge: false, paymentTermsDays: 30 };
  const line = { campaignId: randomUUID(), campaignTitle: 'Matrix campaign', month: '2031-01', tier: null, description: 'Matrix campaign: 10 core-hours', coreHoursMilli: 10_000, unitPriceMinor: 10, amountMinor: 100, discountMinor: 0, taxMinor: 21 };
  const row = await InvoiceRow.create({
    institutionId, runId: null, number: null, currency: 'EUR', periodFrom: '2031-01-01', periodTo: '2031-01-31', rateCard: card, lines: [line],
    subtotalMinor: 100, discountMinor: 0, taxMinor: 21, totalMinor: 121, issuedOn: null, dueOn: null, paidAt: null, voidedAt: null, voidReason: null,
    creditNoteNumber: null, paymentReference: null, paymentState: null, stripeInvoiceId: null, hostedPaymentUrl: null, pdfObjectKey: null, remindedAt: null,
  });
  return row.id;
}
