import { Archive, ArchiveUpload, PartUrls, StoredParts, type ArchiveKind } from '@localis/shared';
import type { ApiClient } from './api-client';
import { isCliError } from './cli-error';

/**
 * Whether the portal answered 404. The ApiClient's errors carry the portal's message but not the
 * status; `status` is read when present, else the portal's wording of a missing resource
 * (`errors.notFound`: "… was not found.").
 */
export function isNotFound(error: unknown): boolean {
  if (!isCliError(error)) return false;
  const status = (error as { status?: unknown }).status;
  if (typeof status === 'number') return status === 404;
  return / was not found\.$/.test(error.message);
}

/** The archive endpoints an upload uses, answers checked with the shared schemas. */
export function archivesApi(client: ApiClient, completeClient: ApiClient = client) {
  return {
    create: (campaignId: string, body: { kind: ArchiveKind; fileName: string; sizeBytes: number; runIds?: string[] }) =>
      client.post(`/campaigns/${campaignId}/archives`, body, ArchiveUpload),

    /** The archive, or null when the portal does not know it (any more). */
    async find(id: string): Promise<Archive | null> {
      try {
        return await client.get(`/archives/${id}`, Archive);
      } catch (e) {
        if (isNotFound(e)) return null;
        throw e;
      }
    },

    get: (id: string) => client.get(`/archives/${id}`, Archive),

    storedParts: async (id: string) => (await client.get(`/archives/${id}/parts`, StoredParts)).parts,

    partUrls: async (id: string, partNumbers: number[]) => (await client.post(`/archives/${id}/part-urls`, { partNumbers }, PartUrls)).urls,

    /** The store assembles the parts: minutes for a very large archive, so its own, longer timeout. */
    complete: (id: string, sha256: string) => completeClient.post(`/archives/${id}/complete`, { sha256 }, Archive),
  };
}
export type ArchivesApi = ReturnType<typeof archivesApi>;
