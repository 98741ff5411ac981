import { Op, literal, type Transaction, type WhereOptions } from 'sequelize';
import {
  parseSort,
  type CampaignEvent as EventDto,
  type CampaignListQuery,
  type CampaignSpec,
  type CampaignState,
  type CampaignSummary,
  type EstimateReport,
  type Notice,
  type Page,
} from '@localis/shared';
import { Campaign, CampaignEvent, Institution, Person, ResearchGroup, Round } from '../db/models';

/** A campaign as the service reasons about it: the summary plus what the rules need. */
export interface CampaignRecord extends CampaignSummary {
  abstract: string;
  justification: string;
  spec: CampaignSpec;
  estimate: Record<string, unknown>;
  notices: Notice[];
  groupPiPersonId: string;
  grantedCoreHours: number | null;
}

/** Whose campaigns a reader may see; ids come from the authenticated principal, never from input. */
export interface Visibility {
  personId: string;
  everything: boolean;
  submittedOnes: boolean;
}

const include = [
  { model: ResearchGroup, as: 'group', attributes: ['name', 'piPersonId'], include: [{ model: Institution, as: 'institution', attributes: ['name'] }] },
  { model: Round, as: 'round', attributes: ['name'] },
  { model: Person, as: 'owner', attributes: ['name'] },
];

/** Groups a person belongs to or leads, as a subquery (the id is quoted by the driver's escape). */
const myGroupsSql = (personId: string) => {
  const id = Campaign.sequelize!.escape(personId);
  return literal(`(SELECT group_id FROM group_memberships WHERE person_id = ${id} UNION SELECT id FROM research_groups WHERE pi_person_id = ${id})`);
};

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

function toSummary(c: Campaign): CampaignSummary {
  return {
    id: c.id,
    title: c.title,
    state: c.state,
    groupId: c.groupId,
    groupName: c.group?.name ?? '',
    institutionName: c.group?.institution?.name ?? '',
    roundId: c.roundId,
    roundName: c.round?.name ?? '',
    ownerPersonId: c.ownerPersonId,
    ownerName: c.owner?.name ?? '',
    machine: c.machine,
    method: c.method as CampaignSummary['method'],
    dimension: c.dimension,
    symmetryClass: c.symmetryClass as CampaignSummary['symmetryClass'],
    requestedCoreHours: Number(c.requestedCoreHours),
    peakMemoryBytes: c.peakMemoryBytes,
    warningCount: c.warningCount,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
    submittedAt: iso(c.submittedAt),
  };
}

function toRecord(c: Campaign): CampaignRecord {
  return {
    ...toSummary(c),
    abstract: c.abstract,
    justification: c.justification,
    spec: c.spec,
    estimate: c.estimate,
    notices: c.notices,
    groupPiPersonId: c.group?.piPersonId ?? '',
    grantedCoreHours: c.grantedCoreHours === null || c.grantedCoreHours === undefined ? null : Number(c.grantedCoreHours),
  };
}

/** The columns a saved spec and its estimate fill, so lists filter and sort without reading JSON. */
export function derivedColumns(spec: CampaignSpec, report: EstimateReport) {
  const { notices, ...estimate } = report;
  return {
    spec,
    estimate: estimate as unknown as Record<string, unknown>,
    notices,
    method: spec.method,
    dimension: spec.dimension,
    symmetryClass: spec.symmetryClass,
    requestedCoreHours: Math.ceil(report.totalCoreHours),
    peakMemoryBytes: report.peakMemoryBytes,
    warningCount: notices.filter((n) => n.severity === 'warning').length,
  };
}

const LIST_EXCLUDED = ['spec', 'estimate', 'notices', 'abstract', 'justification'];

const SORT_COLUMNS: Record<string, unknown[]> = {
  groupName: [{ model: ResearchGroup, as: 'group' }, 'name'],
  roundName: [{ model: Round, as: 'round' }, 'name'],
};

export const campaignsRepository = {
  async list(q: CampaignListQuery, who: Visibility): Promise<Page<CampaignSummary>> {
    const and: WhereOptions<any>[] = [];
    if (!who.everything) {
      const visible: WhereOptions<any>[] = [{ groupId: { [Op.in]: myGroupsSql(who.personId) } }];
      if (who.submittedOnes) visible.push({ submittedAt: { [Op.ne]: null } });
      and.push({ [Op.or]: visible });
    }
    if (q.scope === 'mine') and.push({ ownerPersonId: who.personId });
    if (q.scope === 'my-groups') and.push({ groupId: { [Op.in]: myGroupsSql(who.personId) } });
    if (q.q) {
      const pattern = `%${q.q.replace(/[\\%_]/g, '\\$&')}%`;
      and.push({ [Op.or]: [{ title: { [Op.iLike]: pattern } }, { abstract: { [Op.iLike]: pattern } }] });
    }
    if (q.state) and.push({ state: q.state });
    if (q.roundId) and.push({ roundId: q.roundId });
    if (q.groupId) and.push({ groupId: q.groupId });
    if (q.method) and.push({ method: q.method });
    if (q.dimension) and.push({ dimension: q.dimension });
    if (q.symmetryClass) and.push({ symmetryClass: q.symmetryClass });
    const { field, direction } = parseSort(q.sort);
    // Unsubmitted campaigns have no submission time: they go last whichever way one sorts.
    const first: any[] = field === 'submittedAt' ? [literal(`"Campaign"."submitted_at" ${direction} NULLS LAST`)] : [...(SORT_COLUMNS[field] ?? [field]), direction];
    const where = and.length ? { [Op.and]: and } : {};
    // A list needs the summary only: the spec, estimate and texts (kilobytes of JSON each) stay
    // behind, and the count runs without the joins the names need.
    const [rows, count] = await Promise.all([
      Campaign.findAll({ where, attributes: { exclude: LIST_EXCLUDED }, include, order: [first as any, ['id', 'ASC']], limit: q.limit, offset: q.offset }),
      Campaign.count({ where }),
    ]);
    return { items: rows.map(toSummary), total: count, limit: q.limit, offset: q.offset };
  },

  async find(id: string, tx?: Transaction, lock = false): Promise<CampaignRecord | null> {
    if (lock && tx) {
      // Lock the campaign row alone (outer joins cannot be locked), then read it with its names.
      const locked = await Campaign.findByPk(id, { transaction: tx, lock: tx.LOCK.UPDATE, attributes: ['id'] });
      if (!locked) return null;
    }
    const c = await Campaign.findByPk(id, { include, transaction: tx });
    return c ? toRecord(c) : null;
  },

  async history(campaignId: string, tx?: Transaction): Promise<EventDto[]> {
    const events = await CampaignEvent.findAll({
      where: { campaignId },
      include: [{ model: Person, as: 'actor', attributes: ['name'] }],
      order: [['id', 'ASC']],
      transaction: tx,
    });
    return events.map((e) => ({
      fromState: e.fromState,
      toState: e.toState,
      actorPersonId: e.actorPersonId,
      actorName: e.actor?.name ?? null,
      note: e.note,
      at: e.createdAt.toISOString(),
    }));
  },

  async create(
    values: { id?: string; title: string; abstract: string; justification: string; groupId: string; roundId: string; machine: string; ownerPersonId: string } & ReturnType<typeof derivedColumns>,
    tx: Transaction,
  ): Promise<string> {
    return (await Campaign.create(values, { transaction: tx })).id;
  },

  async update(id: string, values: Partial<Record<string, unknown>>, tx: Transaction): Promise<void> {
    await Campaign.update(values, { where: { id }, transaction: tx });
  },

  async setState(id: string, state: CampaignState, extra: { submittedAt?: Date; decidedAt?: Date; grantedCoreHours?: number | null }, tx: Transaction): Promise<void> {
    await Campaign.update({ state, ...extra }, { where: { id }, transaction: tx });
  },

  async appendEvent(e: { campaignId: string; fromState: CampaignState | null; toState: CampaignState; actorPersonId: string | null; note: string | null }, tx: Transaction): Promise<void> {
    await CampaignEvent.create(e, { transaction: tx });
  },
};
