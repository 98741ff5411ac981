import type { CampaignPermissions, CampaignState, Role } from '@localis/shared';

/** States in which a campaign holds a grant, and so a ledger that moves. */
export const GRANTED_STATES: readonly CampaignState[] = ['granted', 'partly-granted'];

export function holdsGrant(state: CampaignState): boolean {
  return GRANTED_STATES.includes(state);
}

export interface LedgerPermissions {
  /** Add or take back core-hours by hand (the office). */
  adjust: boolean;
  /** Give back a run's core-hours (the office). */
  refund: boolean;
  /** Move core-hours to another granted campaign of the group (its PI, or the office). */
  transfer: boolean;
  /** Record runs by hand or import them (the group's members and PI, or the office). */
  recordRuns: boolean;
}

/**
 * What the ledger and runs pages offer the signed-in person, so only what will work is shown.
 * Transfers and runs depend on the group, which the server tells in the campaign's `can`;
 * adjustments and refunds are the office's alone. The server decides again on every request.
 */
export function ledgerPermissions(roles: readonly Role[], campaign: { state: CampaignState; can: Pick<CampaignPermissions, 'transfer' | 'recordRuns'> }): LedgerPermissions {
  const office = holdsGrant(campaign.state) && roles.includes('admin');
  return {
    adjust: office,
    refund: office,
    transfer: campaign.can.transfer,
    recordRuns: campaign.can.recordRuns,
  };
}
