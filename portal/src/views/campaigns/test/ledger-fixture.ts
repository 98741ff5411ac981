import type { LedgerEntry } from '@localis/shared';
import { campaignFixture } from './campaign-fixture';

/** One entry of the fixture campaign's ledger: what changed, the balance after it, and when. */
export function ledgerEntryFixture(
  kind: LedgerEntry['kind'],
  coreHours: number,
  balanceAfter: number,
  createdAt: string,
  overrides: Partial<LedgerEntry> = {},
): LedgerEntry {
  return {
    id: `${createdAt}-${kind}`,
    campaignId: campaignFixture().id,
    kind,
    coreHours,
    balanceAfter,
    runId: null,
    externalJobId: null,
    counterpartCampaignId: null,
    counterpartTitle: null,
    reason: null,
    overdraft: false,
    actorName: null,
    createdAt,
    ...overrides,
  };
}
