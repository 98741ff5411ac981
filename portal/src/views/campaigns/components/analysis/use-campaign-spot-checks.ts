import type { SpotCheck } from '@localis/shared';
import type { Ref } from 'vue';
import { spotChecksApi } from '../../../../api/spot-checks.api';
import { usePolledList } from '../../../../composables/use-polled-list';
import { isSpotCheckMoving } from '../../lib/spot-check-table';

/** Every 3 s while a spot-check waits or runs: a point takes the kernel up to twenty seconds. */
const POLL_MS = 3000;

/**
 * A campaign's reproducibility spot-checks, newest first, kept live: while one is queued or
 * running the list is asked for again every three seconds (the api has no route for one check),
 * until none is left moving. Polling stops with the page. A first load that fails is said in the
 * section itself, with a way to try again; no toast.
 */
export function useCampaignSpotChecks(campaignId: Ref<string>) {
  return usePolledList<SpotCheck>({ owner: campaignId, fetchList: (id, signal) => spotChecksApi.list(id, signal), isMoving: isSpotCheckMoving, intervalMs: POLL_MS });
}
