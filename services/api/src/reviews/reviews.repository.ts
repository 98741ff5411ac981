import { QueryTypes, type Transaction } from 'sequelize';
import type { Assignment, AssignmentState, CommitteeQueueItem, CommitteeQueueQuery, ReviewInput } from '@localis/shared';
import { Institution, Person, Review, ReviewAssignment } from '../db/models';

const iso = (d: Date) => d.toISOString();

function toDto(a: ReviewAssignment): Assignment {
  const reviewer = a.reviewer as (Person & { institution?: Institution | null }) | undefined;
  const r = a.review ?? null;
  return {
    id: a.id,
    campaignId: a.campaignId,
    reviewerPersonId: a.reviewerPersonId,
    reviewerName: reviewer?.name ?? '',
    reviewerInstitutionName: reviewer?.institution?.name ?? null,
    state: a.state,
    conflictReason: a.conflictReason ?? null,
    assignedAt: iso(a.createdAt),
    review: r
      ? {
          scores: { merit: r.merit, feasibility: r.feasibility, costJustification: r.costJustification },
          toProposers: r.toProposers,
          confidential: r.confidential,
          recommendedCoreHours: Number(r.recommendedCoreHours),
          submittedAt: iso(r.submittedAt),
          updatedAt: iso(r.updatedAt),
        }
      : null,
  };
}

const include = [
  { model: Person, as: 'reviewer', attributes: ['name'], include: [{ model: Institution, as: 'institution', attributes: ['name'] }] },
  { model: Review, as: 'review' },
];

export const reviewsRepository = {
  async forCampaign(campaignId: string, tx?: Transaction): Promise<Assignment[]> {
    const rows = await ReviewAssignment.findAll({ where: { campaignId }, include, order: [['createdAt', 'ASC'], ['id', 'ASC']], transaction: tx });
    return rows.map(toDto);
  },

  async find(id: string, tx?: Transaction): Promise<Assignment | null> {
    const row = await ReviewAssignment.findByPk(id, { include, transaction: tx });
    return row ? toDto(row) : null;
  },

  async findFor(campaignId: string, reviewerPersonId: string, tx?: Transaction): Promise<Assignment | null> {
    const row = await ReviewAssignment.findOne({ where: { campaignId, reviewerPersonId }, include, transaction: tx });
    return row ? toDto(row) : null;
  },

  async create(a: { campaignId: string; reviewerPersonId: string; assignedByPersonId: string | null; state?: AssignmentState; conflictReason?: string | null }, tx: Transaction): Promise<string> {
    return (await ReviewAssignment.create({ ...a, state: a.state ?? 'assigned', conflictReason: a.conflictReason ?? null }, { transaction: tx })).id;
  },

  async setState(id: string, state: AssignmentState, conflictReason: string | null, tx: Transaction): Promise<void> {
    await ReviewAssignment.update({ state, conflictReason }, { where: { id }, transaction: tx });
  },

  async remove(id: string, tx: Transaction): Promise<void> {
    await ReviewAssignment.destroy({ where: { id }, transaction: tx });
  },

  async saveReview(assignmentId: string, input: ReviewInput, tx: Transaction): Promise<void> {
    await Review.upsert(
      {
        assignmentId,
        merit: input.scores.merit,
        feasibility: input.scores.feasibility,
        costJustification: input.scores.costJustification,
        toProposers: input.toProposers,
        confidential: input.confidential,
        recommendedCoreHours: input.recommendedCoreHours,
        updatedAt: new Date(),
      },
      { transaction: tx },
    );
    await ReviewAssignment.update({ state: 'reviewed', conflictReason: null }, { where: { id: assignmentId }, transaction: tx });
  },

  /** Active committee members with their institution, for the assignment picker. */
  async committeeMembers(tx?: Transaction): Promise<{ personId: string; name: string; institutionId: string | null; institutionName: string | null }[]> {
    return ReviewAssignment.sequelize!.query(
      `SELECT p.id AS "personId", p.name, p.institution_id AS "institutionId", i.name AS "institutionName"
         FROM people p JOIN role_grants g ON g.person_id = p.id AND g.role = 'committee'
         LEFT JOIN institutions i ON i.id = p.institution_id
        WHERE p.active ORDER BY p.name`,
      { type: QueryTypes.SELECT, transaction: tx },
    );
  },

  /** Proposals before the committee with everyone's progress and the caller's part. */
  /**
   * `ownGroupsToo` is for the office; committee members never see their own groups' proposals in
   * the queue (its scores and progress are for the committee, and they are proposers there).
   */
  async queue(personId: string, q: CommitteeQueueQuery, ownGroupsToo: boolean): Promise<CommitteeQueueItem[]> {
    const rows = await ReviewAssignment.sequelize!.query<Record<string, unknown>>(
      `SELECT c.id AS "campaignId", c.title, c.state, g.name AS "groupName", i.name AS "institutionName",
              c.round_id AS "roundId", r.name AS "roundName", c.machine, c.requested_core_hours::float8 AS "requestedCoreHours",
              c.submitted_at AS "submittedAt",
              count(a.id) FILTER (WHERE a.state IN ('assigned', 'reviewed'))::int AS assigned,
              count(a.id) FILTER (WHERE a.state = 'reviewed')::int AS reviewed,
              count(a.id) FILTER (WHERE a.state = 'conflict')::int AS conflicts,
              max(a.id::text) FILTER (WHERE a.reviewer_person_id = :personId) AS "myAssignmentId",
              max(a.state) FILTER (WHERE a.reviewer_person_id = :personId) AS "myState",
              avg((rv.merit + rv.feasibility + rv.cost_justification) / 3.0)::float8 AS "meanScore"
         FROM campaigns c
         JOIN research_groups g ON g.id = c.group_id
         JOIN institutions i ON i.id = g.institution_id
         JOIN rounds r ON r.id = c.round_id
         LEFT JOIN review_assignments a ON a.campaign_id = c.id
         LEFT JOIN reviews rv ON rv.assignment_id = a.id
        WHERE c.state IN ('submitted', 'in-review')
          ${q.roundId ? 'AND c.round_id = :roundId' : ''}
          ${ownGroupsToo ? '' : `AND g.pi_person_id <> :personId AND NOT EXISTS (SELECT 1 FROM group_memberships gm WHERE gm.group_id = c.group_id AND gm.person_id = :personId)`}
          ${q.scope === 'mine' ? `AND EXISTS (SELECT 1 FROM review_assignments m WHERE m.campaign_id = c.id AND m.reviewer_person_id = :personId AND m.state IN ('assigned', 'reviewed'))` : ''}
        GROUP BY c.id, g.name, i.name, r.name
        ORDER BY c.submitted_at ASC NULLS LAST, c.id`,
      { replacements: { personId, roundId: q.roundId ?? null }, type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({
      ...(r as unknown as CommitteeQueueItem),
      submittedAt: r.submittedAt ? new Date(r.submittedAt as string).toISOString() : null,
      meanScore: r.meanScore === null ? null : Math.round(Number(r.meanScore) * 100) / 100,
    }));
  },
};
