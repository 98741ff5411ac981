import type { ProvenanceEntryList } from '@localis/shared';
import { apiUrl, http } from './http-client';

const provenanceOf = (campaignId: string) => `/campaigns/${encodeURIComponent(campaignId)}/provenance`;

export const provenanceApi = {
  /** The campaign's entries of the provenance log, each with its PROV record. */
  list: (campaignId: string, signal?: AbortSignal) => http.get<ProvenanceEntryList>(provenanceOf(campaignId), undefined, signal),
  /** The same records as one W3C PROV-JSON document, for a download link. */
  provJsonUrl: (campaignId: string) => apiUrl(provenanceOf(campaignId), { format: 'prov-json' }),
};
