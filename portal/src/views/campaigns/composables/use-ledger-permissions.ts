import type { Campaign } from '@localis/shared';
import { computed, type Ref } from 'vue';
import { useSessionStore } from '../../../stores/session.store';
import { ledgerPermissions, type LedgerPermissions } from '../lib/ledger-permissions';

const NONE: LedgerPermissions = { adjust: false, refund: false, transfer: false, recordRuns: false };

/** What the signed-in person may do with a campaign's ledger and runs (see `ledgerPermissions`). */
export function useLedgerPermissions(campaign: Ref<Campaign | null>) {
  const session = useSessionStore();
  return computed(() => (campaign.value ? ledgerPermissions(session.roles, campaign.value) : NONE));
}
