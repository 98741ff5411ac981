import type { SpotCheckList } from '@localis/shared';
import { http } from './http-client';

export const spotChecksApi = {
  /** A campaign's reproducibility spot-checks, newest first: one per verified result archive. */
  list: (campaignId: string, signal?: AbortSignal) => http.get<SpotCheckList>(`/campaigns/${encodeURIComponent(campaignId)}/spot-checks`, undefined, signal),
};
