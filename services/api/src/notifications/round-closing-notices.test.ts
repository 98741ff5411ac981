import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { createInstitution, createPerson, startTestApp, SYSTEM, type TestApp } from '../../test/harness';
import type { RequestContext } from '../http/principal';
import { Notification, Round } from '../db/models';
import { CLOSING_NOTICE_DAYS, sendRoundClosingNotices } from './round-closing-notices';

let t: TestApp;
let pi: Awaited<ReturnType<typeof createPerson>>;
let adminCtx: RequestContext;
const label = `rcn${Date.now().toString(36)}`;
const day = 86_400_000;

/**
 * The sweep runs with a `now` decades ahead, where only this file's rounds close: the test
 * stack's own worker sweeps the present and never meets them.
 */
const NOW = new Date('2093-06-01T08:00:00Z');
const at = (days: number) => new Date(NOW.getTime() + days * day).toISOString();

async function round(name: string, closesInDays: number): Promise<string> {
  return (
    await t.services.rounds.create(adminCtx, { name: `${name} ${label}`, opensAt: at(-60), closesAt: at(closesInDays), pools: [{ machine: 'sweep-cluster', coreHours: 1000 }] })
  ).id;
}

const noticesOf = async (roundId: string) =>
  (await Notification.findAll({ where: { personId: pi.id, kind: 'round-closing' } })).filter((r) => r.dedupeKey.startsWith(`round-closing:${roundId}:`));

/** Closing-notice mails of a round to our PI (mail keys are `round-closing:<round>:<date>:<person>`). */
async function mailsOf(roundId: string): Promise<number> {
  const [{ n }] = await t.db.sequelize.query<{ n: string }>(
    `SELECT count(*) AS n FROM outbox WHERE kind = 'mail' AND payload->>'dedupeKey' LIKE :prefix AND payload->>'dedupeKey' LIKE :person`,
    { replacements: { prefix: `round-closing:${roundId}:%`, person: `%:${pi.id}` }, type: QueryTypes.SELECT },
  );
  return Number(n);
}

beforeAll(async () => {
  t = await startTestApp();
  const admin = await createPerson(t, { roles: ['admin'], label: `${label}-admin` });
  adminCtx = { ...SYSTEM, principal: { personId: admin.id, name: admin.name, email: admin.email, institutionId: null, roles: admin.roles, scopes: ['read', 'write', 'admin'], via: 'session' } };
  const inst = await createInstitution(t);
  pi = await createPerson(t, { roles: ['pi'], institutionId: inst.id, label: `${label}-pi` });
  await t.services.groups.create(SYSTEM, { name: `Sweep Group ${label}`, institutionId: inst.id, piPersonId: pi.id });
});
afterAll(async () => t.close());

describe('round-closing notices', () => {
  describe('window', () => {
    it(`should notice rounds closing within ${CLOSING_NOTICE_DAYS} days, not later ones nor closed ones`, async () => {
      const soon = await round('Soon', 10);
      const later = await round('Later', 30);
      const closed = await round('Closed', -1);
      const sent = await sendRoundClosingNotices(t.db, NOW, t.settings.PUBLIC_URL);
      expect(sent).toContain(soon);
      expect(sent).not.toContain(later);
      expect(sent).not.toContain(closed);
      expect(await noticesOf(soon)).toHaveLength(1);
      expect(await noticesOf(later)).toHaveLength(0);
      expect((await Round.findByPk(soon))!.closingNoticeSentAt).not.toBeNull();
      expect((await Round.findByPk(later))!.closingNoticeSentAt).toBeNull();

      // Two weeks on, the later round is due.
      const sentLater = await sendRoundClosingNotices(t.db, new Date(NOW.getTime() + 20 * day), t.settings.PUBLIC_URL);
      expect(sentLater).toContain(later);
      expect(await noticesOf(later)).toHaveLength(1);
    });
  });

  describe('once', () => {
    it('should send the notice once however often the sweep runs, even two at a time', async () => {
      const id = await round('Once', 7);
      const [a, b] = await Promise.all([sendRoundClosingNotices(t.db, NOW, t.settings.PUBLIC_URL), sendRoundClosingNotices(t.db, NOW, t.settings.PUBLIC_URL)]);
      expect([...a, ...b].filter((r) => r === id)).toHaveLength(1);
      expect(await sendRoundClosingNotices(t.db, NOW, t.settings.PUBLIC_URL)).not.toContain(id);
      expect(await noticesOf(id)).toHaveLength(1);
      expect(await mailsOf(id)).toBe(1);
    });

    it('should notice again when the closing date moves, with the new date', async () => {
      const id = await round('Moved', 5);
      await sendRoundClosingNotices(t.db, NOW, t.settings.PUBLIC_URL);
      expect(await noticesOf(id)).toHaveLength(1);

      const newClose = at(12);
      await t.services.rounds.update(adminCtx, id, { closesAt: newClose });
      expect((await Round.findByPk(id))!.closingNoticeSentAt).toBeNull();
      expect(await sendRoundClosingNotices(t.db, NOW, t.settings.PUBLIC_URL)).toContain(id);

      const notices = await noticesOf(id);
      expect(notices).toHaveLength(2);
      expect(notices.map((n) => n.dedupeKey)).toContain(`round-closing:${id}:${newClose}`);
      expect(await mailsOf(id)).toBe(2);
    });
  });
});
