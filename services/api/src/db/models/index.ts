import type { Sequelize } from 'sequelize';
import { Institution } from './institution.model';
import { Person } from './person.model';
import { ResearchGroup, GroupMembership } from './research-group.model';
import { RoleGrant } from './role-grant.model';
import { ApiToken } from './api-token.model';
import { AuditLog } from './audit-log.model';
import { OutboxMessage } from './outbox-message.model';
import { Round, RoundPool } from './round.model';
import { Campaign, CampaignEvent } from './campaign.model';
import { ReviewAssignment, Review } from './review.model';
import { Run, LedgerEntry, UsageAlert } from './ledger.model';
import { Notification, IdempotencyKey } from './notification.model';
import { AnalysisRow, ArchiveRow, ProvenanceEntryRow, ProvenanceTreeHeadRow } from './archive.model';
import { SpotCheckRecord } from './spot-check.model';
import { InvoiceEntryRow, InvoiceNumberRow, InvoiceRow, InvoiceRunRow, RateCardRow, StripeEventRow } from './billing.model';

export { Institution, Person, ResearchGroup, GroupMembership, RoleGrant, ApiToken, AuditLog, OutboxMessage, Round, RoundPool, Campaign, CampaignEvent, ReviewAssignment, Review, Run, LedgerEntry, UsageAlert, Notification, IdempotencyKey, ArchiveRow, ProvenanceEntryRow, ProvenanceTreeHeadRow, AnalysisRow, SpotCheckRecord, RateCardRow, InvoiceRunRow, InvoiceNumberRow, InvoiceRow, InvoiceEntryRow, StripeEventRow };

export interface Models {
  Institution: typeof Institution;
  Person: typeof Person;
  ResearchGroup: typeof ResearchGroup;
  GroupMembership: typeof GroupMembership;
  RoleGrant: typeof RoleGrant;
  ApiToken: typeof ApiToken;
  AuditLog: typeof AuditLog;
  OutboxMessage: typeof OutboxMessage;
  Round: typeof Round;
  RoundPool: typeof RoundPool;
  Campaign: typeof Campaign;
  CampaignEvent: typeof CampaignEvent;
  ReviewAssignment: typeof ReviewAssignment;
  Review: typeof Review;
  Run: typeof Run;
  LedgerEntry: typeof LedgerEntry;
  UsageAlert: typeof UsageAlert;
  Notification: typeof Notification;
  IdempotencyKey: typeof IdempotencyKey;
  ArchiveRow: typeof ArchiveRow;
  ProvenanceEntryRow: typeof ProvenanceEntryRow;
  ProvenanceTreeHeadRow: typeof ProvenanceTreeHeadRow;
  AnalysisRow: typeof AnalysisRow;
  SpotCheckRecord: typeof SpotCheckRecord;
  RateCardRow: typeof RateCardRow;
  InvoiceRunRow: typeof InvoiceRunRow;
  InvoiceNumberRow: typeof InvoiceNumberRow;
  InvoiceRow: typeof InvoiceRow;
  InvoiceEntryRow: typeof InvoiceEntryRow;
  StripeEventRow: typeof StripeEventRow;
}

/**
 * Bind the models to one Sequelize instance (they are module singletons, so one database per
 * process). Tables come from migrations, never from sync().
 */
export function initModels(sequelize: Sequelize): Models {
  Institution.initModel(sequelize);
  Person.initModel(sequelize);
  ResearchGroup.initModel(sequelize);
  GroupMembership.initModel(sequelize);
  RoleGrant.initModel(sequelize);
  ApiToken.initModel(sequelize);
  AuditLog.initModel(sequelize);
  OutboxMessage.initModel(sequelize);
  Round.initModel(sequelize);
  RoundPool.initModel(sequelize);
  Campaign.initModel(sequelize);
  CampaignEvent.initModel(sequelize);
  ReviewAssignment.initModel(sequelize);
  Review.initModel(sequelize);
  Run.initModel(sequelize);
  LedgerEntry.initModel(sequelize);
  UsageAlert.initModel(sequelize);
  Notification.initModel(sequelize);
  IdempotencyKey.initModel(sequelize);
  ArchiveRow.initModel(sequelize);
  ProvenanceEntryRow.initModel(sequelize);
  ProvenanceTreeHeadRow.initModel(sequelize);
  AnalysisRow.initModel(sequelize);
  SpotCheckRecord.initModel(sequelize);
  for (const m of [RateCardRow, InvoiceRunRow, InvoiceNumberRow, InvoiceRow, InvoiceEntryRow, StripeEventRow]) m.initModel(sequelize);

  Person.belongsTo(Institution, { foreignKey: 'institutionId', as: 'institution' });
  Person.hasMany(RoleGrant, { foreignKey: 'personId', as: 'roleGrants' });
  RoleGrant.belongsTo(Person, { foreignKey: 'personId', as: 'person' });
  ResearchGroup.belongsTo(Institution, { foreignKey: 'institutionId', as: 'institution' });
  ResearchGroup.belongsTo(Person, { foreignKey: 'piPersonId', as: 'pi' });
  ResearchGroup.hasMany(GroupMembership, { foreignKey: 'groupId', as: 'memberships' });
  GroupMembership.belongsTo(Person, { foreignKey: 'personId', as: 'person' });
  GroupMembership.belongsTo(ResearchGroup, { foreignKey: 'groupId', as: 'group' });
  AuditLog.belongsTo(Person, { foreignKey: 'actorPersonId', as: 'actor' });
  Round.hasMany(RoundPool, { foreignKey: 'roundId', as: 'pools' });
  Campaign.belongsTo(ResearchGroup, { foreignKey: 'groupId', as: 'group' });
  Campaign.belongsTo(Round, { foreignKey: 'roundId', as: 'round' });
  Campaign.belongsTo(Person, { foreignKey: 'ownerPersonId', as: 'owner' });
  CampaignEvent.belongsTo(Person, { foreignKey: 'actorPersonId', as: 'actor' });
  ReviewAssignment.belongsTo(Person, { foreignKey: 'reviewerPersonId', as: 'reviewer' });
  ReviewAssignment.hasOne(Review, { foreignKey: 'assignmentId', as: 'review' });
  ReviewAssignment.belongsTo(Campaign, { foreignKey: 'campaignId', as: 'campaign' });
  Run.belongsTo(Person, { foreignKey: 'recordedByPersonId', as: 'recordedBy' });
  LedgerEntry.belongsTo(Person, { foreignKey: 'actorPersonId', as: 'actor' });
  LedgerEntry.belongsTo(Run, { foreignKey: 'runId', as: 'run' });
  LedgerEntry.belongsTo(Campaign, { foreignKey: 'counterpartCampaignId', as: 'counterpart' });
  ArchiveRow.belongsTo(Person, { foreignKey: 'uploadedByPersonId', as: 'uploadedBy' });
  ArchiveRow.belongsTo(Person, { foreignKey: 'withdrawnByPersonId', as: 'withdrawnBy' });
  AnalysisRow.belongsTo(Person, { foreignKey: 'requestedByPersonId', as: 'requestedBy' });
  SpotCheckRecord.belongsTo(ArchiveRow, { foreignKey: 'archiveId', as: 'archive' });
  RateCardRow.belongsTo(Person, { foreignKey: 'createdByPersonId', as: 'createdBy' });
  InvoiceRow.belongsTo(Institution, { foreignKey: 'institutionId', as: 'institution' });
  return { Institution, Person, ResearchGroup, GroupMembership, RoleGrant, ApiToken, AuditLog, OutboxMessage, Round, RoundPool, Campaign, CampaignEvent, ReviewAssignment, Review, Run, LedgerEntry, UsageAlert, Notification, IdempotencyKey, ArchiveRow, ProvenanceEntryRow, ProvenanceTreeHeadRow, AnalysisRow, SpotCheckRecord, RateCardRow, InvoiceRunRow, InvoiceNumberRow, InvoiceRow, InvoiceEntryRow, StripeEventRow };
}
