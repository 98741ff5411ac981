import { Op, QueryTypes, literal, type Transaction } from 'sequelize';
import { balancesOf, fromMilli, type CampaignState, type LedgerKind } from '@localis/shared';
import { Campaign, CampaignEvent, Person, ResearchGroup, ReviewAssignment, Round } from '../db/models';

/** Someone a notification may go to. */
export interface Recipient {
  id: string;
  name: string;
  email: string;
  /** Optional mails turned on or off; missing keys are on. */
  mailPreferences: Record<string, boolean>;
}

export interface CampaignFacts {
  id: string;
  title: string;
  state: CampaignState;
  machine: string;
  requestedCoreHours: number;
  grantedCoreHours: number | null;
  ownerPersonId: string;
  groupName: string;
  piPersonId: string;
  roundName: string;
  allocationEndsAt: Date;
  overdraftPercent: number;
}

const recipientAttributes = ['id', 'name', 'email', 'mailPreferences'] as const;
const toRecipient = (p: Person): Recipient => ({ id: p.id, name: p.name, email: p.email, mailPreferences: p.mailPreferences ?? {} });

/** What an event is about and who is there to hear of it, read inside the caller's transaction. */
export const eventFactsRepository = {
  async campaign(id: string, tx: Transaction): Promise<CampaignFacts | null> {
    const c = await Campaign.findByPk(id, {
      attributes: ['id', 'title', 'state', 'machine', 'requestedCoreHours', 'grantedCoreHours', 'ownerPersonId'],
      include: [
        { model: ResearchGroup, as: 'group', attributes: ['name', 'piPersonId'] },
        { model: Round, as: 'round', attributes: ['name', 'allocationEndsAt', 'overdraftPercent'] },
      ],
      transaction: tx,
    });
    if (!c) return null;
    return {
      id: c.id,
      title: c.title,
      state: c.state,
      machine: c.machine,
      requestedCoreHours: Number(c.requestedCoreHours),
      grantedCoreHours: c.grantedCoreHours === null ? null : Number(c.grantedCoreHours),
      ownerPersonId: c.ownerPersonId,
      groupName: c.group!.name,
      piPersonId: c.group!.piPersonId,
      roundName: c.round!.name,
      allocationEndsAt: c.round!.allocationEndsAt,
      overdraftPercent: c.round!.overdraftPercent,
    };
  },

  /** The note of the event that moved the campaign into its present state (the decision message). */
  async noteOfLatestMove(campaignId: string, toState: CampaignState, tx: Transaction): Promise<string | null> {
    const e = await CampaignEvent.findOne({ where: { campaignId, toState }, order: [['id', 'DESC']], attributes: ['note'], transaction: tx });
    return e?.note ?? null;
  },

  async assignment(id: string, tx: Transaction): Promise<{ campaignId: string; reviewerPersonId: string } | null> {
    const a = await ReviewAssignment.findByPk(id, { attributes: ['campaignId', 'reviewerPersonId'], transaction: tx });
    return a ? { campaignId: a.campaignId, reviewerPersonId: a.reviewerPersonId } : null;
  },

  /** Granted and used core-hours of a campaign, from its ledger entries alone. */
  async usage(campaignId: string, tx: Transaction): Promise<{ grantedCoreHours: number; usedCoreHours: number }> {
    const rows = await Campaign.sequelize!.query<{ kind: LedgerKind; milli: string }>(
      'SELECT kind, sum(milli)::text AS milli FROM ledger_entries WHERE campaign_id = :campaignId GROUP BY kind',
      { replacements: { campaignId }, type: QueryTypes.SELECT, transaction: tx },
    );
    const b = balancesOf(rows.map((r) => ({ kind: r.kind, milli: Number(r.milli) })));
    return { grantedCoreHours: fromMilli(b.granted), usedCoreHours: fromMilli(b.used) };
  },

  async round(id: string, tx: Transaction): Promise<{ id: string; name: string; closesAt: Date } | null> {
    const r = await Round.findByPk(id, { attributes: ['id', 'name', 'closesAt'], transaction: tx });
    return r ? { id: r.id, name: r.name, closesAt: r.closesAt } : null;
  },

  /** The active ones among these people; deactivated accounts hear nothing. */
  async activePeople(ids: string[], tx: Transaction): Promise<Recipient[]> {
    if (!ids.length) return [];
    const people = await Person.findAll({ where: { id: { [Op.in]: [...new Set(ids)] }, active: true }, attributes: [...recipientAttributes], transaction: tx });
    return people.map(toRecipient);
  },

  async activeAdmins(tx: Transaction): Promise<Recipient[]> {
    const people = await Person.findAll({
      where: { active: true, id: { [Op.in]: literal(`(SELECT person_id FROM role_grants WHERE role = 'admin')`) } },
      attributes: [...recipientAttributes],
      order: [['id', 'ASC']],
      transaction: tx,
    });
    return people.map(toRecipient);
  },

  /** Everyone who leads a research group. */
  async activeGroupPis(tx: Transaction): Promise<Recipient[]> {
    const people = await Person.findAll({
      where: { active: true, id: { [Op.in]: literal('(SELECT pi_person_id FROM research_groups)') } },
      attributes: [...recipientAttributes],
      order: [['id', 'ASC']],
      transaction: tx,
    });
    return people.map(toRecipient);
  },

  /** Drafts of a round by owner, oldest first. */
  async draftsByOwner(roundId: string, tx: Transaction): Promise<Map<string, { id: string; title: string }[]>> {
    const drafts = await Campaign.findAll({
      where: { roundId, state: 'draft' },
      attributes: ['id', 'title', 'ownerPersonId'],
      order: [['createdAt', 'ASC'], ['id', 'ASC']],
      transaction: tx,
    });
    const byOwner = new Map<string, { id: string; title: string }[]>();
    for (const d of drafts) {
      const list = byOwner.get(d.ownerPersonId) ?? [];
      list.push({ id: d.id, title: d.title });
      byOwner.set(d.ownerPersonId, list);
    }
    return byOwner;
  },
};
