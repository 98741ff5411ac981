import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadSettings } from '@localis/shared';
import { AuditLog, Campaign, openDatabase, Person, Round, type Database } from '@localis/api/db';
import { CAMPAIGN_STATES, roundStatus } from '@localis/shared';
import { CAMPAIGNS, ROUNDS } from './campaigns-scenario';
import { hashToken } from '@localis/api/tokens';
import { ApiToken } from '@localis/api/db';
import { loadScenario } from './load-scenario';
import { GROUPS, PEOPLE } from './scenario';

const settings = loadSettings(process.env);
let db: Database;
beforeAll(() => {
  db = openDatabase(settings, { poolMax: 2 });
});
afterAll(async () => db.close());

describe('demo scenario', () => {
  describe('repeatability', () => {
    it('should change nothing when loaded a second time', async () => {
      await loadScenario(db, settings);
      const auditBefore = await AuditLog.count();
      const again = await loadScenario(db, settings);
      expect(again).toEqual({ institutions: 0, people: 0, groups: 0, members: 0, tokens: 0, rounds: 0, campaigns: 0 });
      expect(await AuditLog.count()).toBe(auditBefore);
    });
  });

  describe('content', () => {
    it('should give every demo person their roles, groups and a working API token', async () => {
      for (const p of PEOPLE) expect(await Person.findByPk(p.id), p.email).not.toBeNull();
      const tokens = JSON.parse(readFileSync(join(settings.DATA_DIR, 'demo-tokens.json'), 'utf8')) as Record<string, string>;
      expect(Object.keys(tokens).sort()).toEqual(PEOPLE.map((p) => p.email).sort());
      for (const [email, secret] of Object.entries(tokens)) {
        const row = await ApiToken.findOne({ where: { tokenHash: hashToken(secret) } });
        expect(row?.personId, email).toBe(PEOPLE.find((p) => p.email === email)!.id);
      }
      expect(GROUPS.every((g) => g.memberIds.includes(g.piPersonId))).toBe(true);
    });

    it('should hold an open and a closed round and campaigns in every state, each as the story has it', async () => {
      const rounds = await Round.findAll({ where: { id: ROUNDS.map((r) => r.id) } });
      expect(rounds.map((r) => roundStatus({ opensAt: r.opensAt.toISOString(), closesAt: r.closesAt.toISOString() })).sort()).toEqual(['closed', 'open']);
      const campaigns = await Campaign.findAll({ where: { id: CAMPAIGNS.map((c) => c.id) } });
      for (const c of CAMPAIGNS) expect(campaigns.find((x) => x.id === c.id)?.state, c.input.title).toBe(c.state);
      expect(new Set(campaigns.map((c) => c.state))).toEqual(new Set(CAMPAIGN_STATES));
      expect(campaigns.some((c) => (c.spec.pilotTimings ?? []).length > 0)).toBe(true);
    });
  });
});
