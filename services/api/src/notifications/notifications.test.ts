import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { EXAMPLE_CAMPAIGN_SPEC, type MailMessage, type NotificationPage, type Role } from '@localis/shared';
import { createInstitution, createPerson, startTestApp, SYSTEM, tokenFor, withToken, type TestApp } from '../../test/harness';
import type { RequestContext } from '../http/principal';
import { AuditLog, Campaign as CampaignModel, CampaignEvent, LedgerEntry, Notification, ReviewAssignment, Run } from '../db/models';
import { notificationsRepository } from './notifications.repository';
import { notify, type NotificationEvent } from './notify';

type TestPerson = Awaited<ReturnType<typeof createPerson>>;

let t: TestApp;
let pi: TestPerson;
let researcher: TestPerson;
let admin: TestPerson;
let committee: TestPerson;
let retiredAdmin: TestPerson;
let researcherToken: string;
let groupId: string;
let openRoundId: string;

const MACHINE = 'notify-test-cluster';
const label = `ntf${Date.now().toString(36)}`;
const ctxOf = (p: { id: string; name: string; email: string; institutionId: string | null; roles: Role[] }): RequestContext => ({
  ...SYSTEM, principal: { personId: p.id, name: p.name, email: p.email, institutionId: p.institutionId, roles: p.roles, scopes: ['read', 'write', 'admin'], via: 'session' },
});
const call = (token: string, method: string, path: string, body?: unknown) => withToken(t, token, method, `/api/v1${path}`, body);

/** notify() as the services call it: inside a transaction of its own here. */
const notifyNow = (event: NotificationEvent) => t.db.transaction((tx) => notify(event, tx, t.settings.PUBLIC_URL));

const rowsOf = (personId: string, dedupeKey: string) => Notification.findAll({ where: { personId, dedupeKey } });

/** Outbox mails whose dedupe key starts with `prefix` (keys are `<kind>:<what>:<person>`). */
async function mailsWith(prefix: string): Promise<MailMessage[]> {
  const rows = await t.db.sequelize.query<{ payload: MailMessage }>(
    `SELECT payload FROM outbox WHERE kind = 'mail' AND payload->>'dedupeKey' LIKE :prefix ORDER BY id`,
    { replacements: { prefix: `${prefix.replace(/[\\%_]/g, '\\$&')}%` }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => r.payload);
}

async function draft(title: string, roundId = openRoundId, owner = researcher): Promise<string> {
  const c = await t.services.campaigns.create(ctxOf(owner), {
    title, abstract: 'Transfer-matrix study of the orthogonal class around the critical disorder.', justification: '',
    groupId, roundId, machine: MACHINE, spec: EXAMPLE_CAMPAIGN_SPEC as never,
  });
  return c.id;
}

/** A proposal the office decided on, set up at the table level so these tests depend on notify alone. */
async function decided(title: string, granted: number, note: string | null): Promise<string> {
  const id = await draft(title);
  await t.services.campaigns.submit(ctxOf(pi), id);
  await CampaignModel.update({ state: 'granted', grantedCoreHours: granted, decidedAt: new Date() }, { where: { id } });
  await CampaignEvent.create({ campaignId: id, fromState: 'submitted', toState: 'granted', actorPersonId: admin.id, note });
  return id;
}

beforeAll(async () => {
  t = await startTestApp();
  const inst = await createInstitution(t);
  pi = await createPerson(t, { roles: ['pi', 'researcher'], institutionId: inst.id, label: `${label}-pi` });
  researcher = await createPerson(t, { roles: ['researcher'], institutionId: inst.id, label: `${label}-researcher` });
  admin = await createPerson(t, { roles: ['admin'], label: `${label}-admin` });
  committee = await createPerson(t, { roles: ['committee'], label: `${label}-committee` });
  retiredAdmin = await createPerson(t, { roles: ['admin'], label: `${label}-retired` });
  await t.services.people.update(ctxOf(admin), retiredAdmin.id, { active: false });
  groupId = (await t.services.groups.create(SYSTEM, { name: `Notify Group ${label}`, institutionId: inst.id, piPersonId: pi.id })).id;
  await t.services.groups.addMember(ctxOf(admin), groupId, researcher.id);
  const day = 86_400_000;
  openRoundId = (
    await t.services.rounds.create(ctxOf(admin), {
      name: `Notify open ${label}`, opensAt: new Date(Date.now() - day).toISOString(), closesAt: new Date(Date.now() + 60 * day).toISOString(),
      pools: [{ machine: MACHINE, coreHours: 5_000_000 }],
    })
  ).id;
  researcherToken = await tokenFor(t, researcher);
});
afterAll(async () => t.close());

describe('notifications', () => {
  describe('notify', () => {
    it('should tell the PI and every active admin once when a proposal is submitted', async () => {
      const title = `Submitted <b>${label}</b>`;
      const id = await draft(title);
      await t.services.campaigns.submit(ctxOf(pi), id);
      // The submission may have notified already; telling again changes nothing.
      await notifyNow({ kind: 'proposal-submitted', campaignId: id });
      await notifyNow({ kind: 'proposal-submitted', campaignId: id });

      const key = `proposal-submitted:${id}`;
      const [piRows, adminRows, ownerRows, retiredRows] = await Promise.all([rowsOf(pi.id, key), rowsOf(admin.id, key), rowsOf(researcher.id, key), rowsOf(retiredAdmin.id, key)]);
      expect(piRows).toHaveLength(1);
      expect(piRows[0]).toMatchObject({ kind: 'proposal-submitted', title: `Submitted: ${title}`, link: `/campaigns/${id}`, readAt: null });
      expect(adminRows).toHaveLength(1);
      expect(adminRows[0].title).toBe(`New proposal: ${title}`);
      expect(ownerRows).toHaveLength(0);
      expect(retiredRows).toHaveLength(0);

      const mails = await mailsWith(`proposal-submitted:${id}:`);
      const to = (p: TestPerson) => mails.filter((m) => m.to.includes(p.email));
      expect(to(pi)).toHaveLength(1);
      expect(to(admin)).toHaveLength(1);
      expect(to(retiredAdmin)).toHaveLength(0);
      expect(to(pi)[0].dedupeKey).toBe(`proposal-submitted:${id}:${pi.id}`);
      // The submission itself may have queued it, with the process's PUBLIC_URL: any absolute link.
      expect(to(pi)[0].text).toMatch(new RegExp(`Open the proposal: https?://\\S+/campaigns/${id}\n`));
      expect(to(pi)[0].html).toContain(`Submitted &lt;b&gt;${label}&lt;/b&gt;`);
      expect(to(pi)[0].html).not.toContain('<b>');
    });

    it('should ask the reviewer once, by mail whatever their settings, when a review is assigned', async () => {
      const id = await draft(`Reviewed ${label}`);
      await t.services.campaigns.submit(ctxOf(pi), id);
      const assignment = await ReviewAssignment.create({ campaignId: id, reviewerPersonId: committee.id, assignedByPersonId: admin.id });
      await notifyNow({ kind: 'review-assigned', assignmentId: assignment.id });
      await notifyNow({ kind: 'review-assigned', assignmentId: assignment.id });

      const rows = await rowsOf(committee.id, `review-assigned:${assignment.id}`);
      expect(rows).toHaveLength(1);
      expect(rows[0]).toMatchObject({ kind: 'review-assigned', title: `Please review: Reviewed ${label}`, link: '/committee' });
      const mails = await mailsWith(`review-assigned:${assignment.id}:`);
      expect(mails).toHaveLength(1);
      expect(mails[0]).toMatchObject({ to: [committee.email], dedupeKey: `review-assigned:${assignment.id}:${committee.id}` });
      expect(mails[0].text).toContain(`${t.settings.PUBLIC_URL}/committee`);
    });

    it('should tell the owner and the PI of a decision with the office message, by mail even when optional mails are off', async () => {
      await call(researcherToken, 'PATCH', '/me/mail-preferences', { 'proposal-submitted': false, 'usage-threshold': false, 'round-closing': false });
      try {
        const id = await decided(`Decided ${label}`, 500, 'Well argued.\nStart with <i>L = 16</i>.');
        await notifyNow({ kind: 'decision', campaignId: id });
        await notifyNow({ kind: 'decision', campaignId: id });

        for (const p of [researcher, pi]) {
          const rows = await rowsOf(p.id, `decision:${id}`);
          expect(rows).toHaveLength(1);
          expect(rows[0].title).toBe(`Granted: Decided ${label}`);
          expect(rows[0].body).toContain('500 core-hours');
          expect(rows[0].body).toContain('Message from the office: Well argued.\nStart with <i>L = 16</i>.');
          expect(rows[0].link).toBe(`/campaigns/${id}`);
        }
        const mails = await mailsWith(`decision:${id}:`);
        expect(mails.map((m) => m.to[0]).sort()).toEqual([pi.email, researcher.email].sort());
        expect(mails[0].html).toContain('Start with &lt;i&gt;L = 16&lt;/i&gt;.');
      } finally {
        await call(researcherToken, 'PATCH', '/me/mail-preferences', { 'proposal-submitted': true, 'usage-threshold': true, 'round-closing': true });
      }
    });

    it('should refuse to report a decision on a campaign that has none', async () => {
      const id = await draft(`Undecided ${label}`);
      await expect(notifyNow({ kind: 'decision', campaignId: id })).rejects.toThrow(/not decided/);
    });

    it('should report usage from the ledger once per threshold and leave out the mail a person turned off', async () => {
      const id = await decided(`Used ${label}`, 500, null);
      await LedgerEntry.create({ campaignId: id, kind: 'grant', milli: 500_000, runId: null, counterpartCampaignId: null, reason: null, actorPersonId: admin.id });
      const start = new Date(Date.now() - 3 * 3_600_000);
      const run = await Run.create({
        campaignId: id, externalJobId: `job-${randomUUID()}`, machine: MACHINE, startedAt: start, endedAt: new Date(start.getTime() + 3_600_000), cores: 400,
        coreHoursMilli: 400_000, codeName: 'tmm', codeVersion: '1.0', parameters: {} as never, source: 'api', recordedByPersonId: researcher.id,
      });
      await LedgerEntry.create({ campaignId: id, kind: 'debit', milli: -400_000, runId: run.id, counterpartCampaignId: null, reason: null, actorPersonId: researcher.id });
      expect((await call(researcherToken, 'PATCH', '/me/mail-preferences', { 'usage-threshold': false })).status).toBe(200);
      try {
        await notifyNow({ kind: 'usage-threshold', campaignId: id, threshold: 75 });
        await notifyNow({ kind: 'usage-threshold', campaignId: id, threshold: 75 });

        for (const p of [researcher, pi]) {
          const rows = await rowsOf(p.id, `usage:${id}:75`);
          expect(rows).toHaveLength(1);
          expect(rows[0]).toMatchObject({ kind: 'usage-threshold', link: `/campaigns/${id}/ledger` });
          expect(rows[0].body).toContain('400 core-hours of its 500 core-hours (80 %)');
        }
        const mails = await mailsWith(`usage-threshold:${id}:75:`);
        expect(mails.map((m) => m.to)).toEqual([[pi.email]]);

        await notifyNow({ kind: 'usage-threshold', campaignId: id, threshold: 90 });
        expect(await rowsOf(pi.id, `usage:${id}:90`)).toHaveLength(1);
        expect(await rowsOf(researcher.id, `usage:${id}:90`)).toHaveLength(1);
      } finally {
        await call(researcherToken, 'PATCH', '/me/mail-preferences', { 'usage-threshold': true });
      }
    });

    it('should tell every active PI and the owners of drafts when a round closes, once per closing date', async () => {
      // Far in the future, so no sweep of the running test stack picks this round up meanwhile.
      const round = await t.services.rounds.create(ctxOf(admin), {
        name: `Notify closing ${label}`, opensAt: '2091-01-01T00:00:00Z', closesAt: '2091-03-31T23:59:00Z', pools: [{ machine: MACHINE, coreHours: 1000 }],
      });
      const draftId = await draft(`Closing draft ${label}`, round.id);
      const inst = await createInstitution(t);
      const formerPi = await createPerson(t, { roles: ['pi'], institutionId: inst.id, label: `${label}-former-pi` });
      await t.services.groups.create(SYSTEM, { name: `Former Group ${label}`, institutionId: inst.id, piPersonId: formerPi.id });
      await t.services.people.update(ctxOf(admin), formerPi.id, { active: false });
      expect((await call(researcherToken, 'PATCH', '/me/mail-preferences', { 'round-closing': false })).status).toBe(200);
      try {
        await notifyNow({ kind: 'round-closing', roundId: round.id });
        await notifyNow({ kind: 'round-closing', roundId: round.id });

        const key = `round-closing:${round.id}:2091-03-31T23:59:00.000Z`;
        const piRows = await rowsOf(pi.id, key);
        expect(piRows).toHaveLength(1);
        expect(piRows[0]).toMatchObject({ kind: 'round-closing', link: '/campaigns/new' });
        expect(piRows[0].title).toContain(`Notify closing ${label} closes on`);
        const ownerRows = await rowsOf(researcher.id, key);
        expect(ownerRows).toHaveLength(1);
        expect(ownerRows[0].link).toBe(`/campaigns/${draftId}`);
        expect(ownerRows[0].body).toContain(`Closing draft ${label}`);
        expect(await rowsOf(committee.id, key)).toHaveLength(0);
        expect(await rowsOf(formerPi.id, key)).toHaveLength(0);

        const mails = await mailsWith(`round-closing:${round.id}:`);
        expect(mails.filter((m) => m.to.includes(pi.email))).toHaveLength(1);
        expect(mails.filter((m) => m.to.includes(researcher.email))).toHaveLength(0);
        expect(mails.filter((m) => m.to.includes(formerPi.email))).toHaveLength(0);

        await t.services.rounds.update(ctxOf(admin), round.id, { closesAt: '2091-04-07T23:59:00Z' });
        await notifyNow({ kind: 'round-closing', roundId: round.id });
        expect(await rowsOf(pi.id, `round-closing:${round.id}:2091-04-07T23:59:00.000Z`)).toHaveLength(1);
        expect((await mailsWith(`round-closing:${round.id}:`)).filter((m) => m.to.includes(pi.email))).toHaveLength(2);
      } finally {
        await call(researcherToken, 'PATCH', '/me/mail-preferences', { 'round-closing': true });
      }
    });

    it('should write nothing when the change it reports is rolled back', async () => {
      const id = await draft(`Rolled back ${label}`);
      await t.services.campaigns.submit(ctxOf(pi), id);
      const assignment = await ReviewAssignment.create({ campaignId: id, reviewerPersonId: committee.id, assignedByPersonId: admin.id });
      await expect(
        t.db.transaction(async (tx) => {
          await notify({ kind: 'review-assigned', assignmentId: assignment.id }, tx, t.settings.PUBLIC_URL);
          throw new Error('the assignment failed');
        }),
      ).rejects.toThrow('the assignment failed');
      expect(await rowsOf(committee.id, `review-assigned:${assignment.id}`)).toHaveLength(0);
      expect(await mailsWith(`review-assigned:${assignment.id}:`)).toHaveLength(0);
    });
  });

  describe('my notifications', () => {
    let reader: TestPerson;
    let readerToken: string;
    let readOnlyToken: string;
    let othersId: string;

    beforeAll(async () => {
      // No role at all: notifications are for everyone signed in.
      reader = await createPerson(t, { roles: [], label: `${label}-reader` });
      const other = await createPerson(t, { roles: [], label: `${label}-other` });
      readerToken = await tokenFor(t, reader);
      readOnlyToken = await tokenFor(t, reader, ['read']);
      await t.db.transaction((tx) =>
        notificationsRepository.insertNew(
          [1, 2, 3].map((n) => ({ personId: reader.id, kind: 'decision' as const, title: `Note ${n}`, body: `Body ${n}`, link: `/campaigns/${n}`, dedupeKey: `test:${label}:${n}` })),
          tx,
        ),
      );
      await t.db.transaction((tx) =>
        notificationsRepository.insertNew([{ personId: other.id, kind: 'decision', title: 'Not yours', body: 'Not yours', link: null, dedupeKey: `test:${label}:other` }], tx),
      );
      othersId = String((await Notification.findOne({ where: { personId: other.id } }))!.id);
    });

    const page = async (query = '') => {
      const res = await call(readerToken, 'GET', `/me/notifications${query}`);
      expect(res.status).toBe(200);
      return (await res.json()) as NotificationPage;
    };

    it('should list my notifications newest first with the unread count', async () => {
      const all = await page();
      expect(all.total).toBe(3);
      expect(all.unread).toBe(3);
      expect(all.items.map((n) => n.title)).toEqual(['Note 3', 'Note 2', 'Note 1']);
      expect(all.items[0]).toMatchObject({ kind: 'decision', body: 'Body 3', link: '/campaigns/3', readAt: null });
      const firstTwo = await page('?unread=true&limit=2');
      expect(firstTwo.items).toHaveLength(2);
      expect(firstTwo).toMatchObject({ total: 3, limit: 2, offset: 0 });
    });

    it("should mark mine read and leave another person's notification as it was", async () => {
      const [newest] = (await page()).items;
      const res = await call(readerToken, 'POST', '/me/notifications/read', { ids: [newest.id, othersId, '99999999999999999999999'] });
      expect(res.status).toBe(200);
      expect(await res.json()).toEqual({ unread: 2 });
      expect((await Notification.findByPk(othersId))!.readAt).toBeNull();
      const unread = await page('?unread=true');
      expect(unread.total).toBe(2);
      expect(unread.items.map((n) => n.title)).toEqual(['Note 2', 'Note 1']);
      expect((await page()).items[0].readAt).not.toBeNull();
    });

    it('should mark all read when asked, and refuse a body that names nothing', async () => {
      expect((await call(readerToken, 'POST', '/me/notifications/read', {})).status).toBe(422);
      expect((await call(readerToken, 'POST', '/me/notifications/read', { ids: ['abc'] })).status).toBe(422);
      const res = await call(readerToken, 'POST', '/me/notifications/read', { all: true });
      expect(await res.json()).toEqual({ unread: 0 });
      expect((await page('?unread=true')).total).toBe(0);
      expect((await Notification.findByPk(othersId))!.readAt).toBeNull();
    });

    it('should let a read-only token read but not mark, and nobody signed out at all', async () => {
      expect((await call(readOnlyToken, 'GET', '/me/notifications')).status).toBe(200);
      expect((await call(readOnlyToken, 'POST', '/me/notifications/read', { all: true })).status).toBe(403);
      expect((await fetch(`${t.url}/api/v1/me/notifications`)).status).toBe(401);
    });
  });

  describe('mail preferences', () => {
    let person: TestPerson;
    let token: string;
    beforeAll(async () => {
      person = await createPerson(t, { roles: ['researcher'], label: `${label}-prefs` });
      token = await tokenFor(t, person);
    });

    it('should have every optional mail on until turned off', async () => {
      const res = await call(token, 'GET', '/me/mail-preferences');
      expect(res.status).toBe(200);
      expect(await res.json()).toEqual({ 'proposal-submitted': true, 'usage-threshold': true, 'round-closing': true });
    });

    it('should turn one off, keep the others, and record the change in the audit log', async () => {
      const res = await call(token, 'PATCH', '/me/mail-preferences', { 'usage-threshold': false });
      expect(res.status).toBe(200);
      expect(await res.json()).toEqual({ 'proposal-submitted': true, 'usage-threshold': false, 'round-closing': true });
      expect(await (await call(token, 'GET', '/me/mail-preferences')).json()).toEqual({ 'proposal-submitted': true, 'usage-threshold': false, 'round-closing': true });
      const audit = await AuditLog.findAll({ where: { targetType: 'person', targetId: person.id, action: 'mail-preferences.updated' } });
      expect(audit).toHaveLength(1);
      expect(audit[0].details).toEqual({ 'usage-threshold': { from: true, to: false } });
      // Saving the same again changes nothing and records nothing.
      await call(token, 'PATCH', '/me/mail-preferences', { 'usage-threshold': false });
      expect(await AuditLog.count({ where: { targetType: 'person', targetId: person.id, action: 'mail-preferences.updated' } })).toBe(1);
    });

    it.each([
      ['a kind that always goes out', { decision: false }],
      ['an unknown key', { newsletter: false }],
      ['a value that is not true or false', { 'round-closing': 'no' }],
    ])('should answer 422 for %s', async (_name, body) => {
      const res = await call(token, 'PATCH', '/me/mail-preferences', body);
      expect(res.status).toBe(422);
      expect(((await res.json()) as { error: { code: string } }).error.code).toBe('invalid');
    });

    it('should refuse a change through a read-only token', async () => {
      const readOnly = await tokenFor(t, person, ['read']);
      expect((await call(readOnly, 'GET', '/me/mail-preferences')).status).toBe(200);
      expect((await call(readOnly, 'PATCH', '/me/mail-preferences', { 'round-closing': false })).status).toBe(403);
    });
  });
});
