import type { Archive, ArchiveKind, ArchiveList, ArchiveUpload, DownloadLink, PartUrls, StoredParts } from '@localis/shared';
import { http } from './http-client';

/** What the portal sends to start an upload; the api checks it with CreateArchiveRequest. */
export interface NewArchive {
  kind: ArchiveKind;
  fileName: string;
  sizeBytes: number;
  runIds?: string[];
}

const archivesOf = (campaignId: string) => `/campaigns/${encodeURIComponent(campaignId)}/archives`;
const archive = (id: string) => `/archives/${encodeURIComponent(id)}`;

export const archivesApi = {
  list: (campaignId: string, signal?: AbortSignal) => http.get<ArchiveList>(archivesOf(campaignId), undefined, signal),
  get: (id: string) => http.get<Archive>(archive(id)),
  /** Starts an upload: the archive, in state `uploading`, and how to cut the file into parts. */
  create: (campaignId: string, input: NewArchive) => http.post<ArchiveUpload>(archivesOf(campaignId), input),
  /** The parts the store holds already, so a resumed upload sends only the others. */
  storedParts: (id: string) => http.get<StoredParts>(`${archive(id)}/parts`),
  /** Presigned addresses to PUT parts to, at most 100 at a time; they expire after minutes. */
  partUrls: (id: string, partNumbers: number[]) => http.post<PartUrls>(`${archive(id)}/part-urls`, { partNumbers }),
  /** Every part is stored: the api joins them and queues the check against this SHA-256. */
  complete: (id: string, sha256: string) => http.post<Archive>(`${archive(id)}/complete`, { sha256 }),
  /** A short-lived address to fetch the file from the store. */
  downloadLink: (id: string) => http.get<DownloadLink>(`${archive(id)}/download`),
  /** Gives up an unfinished upload: the store drops its parts and the archive ends rejected. */
  cancel: (id: string) => http.post<Archive>(`${archive(id)}/cancel`),
  /** Marks the archive withdrawn; it is kept, with the reason. */
  withdraw: (id: string, reason: string) => http.post<Archive>(`${archive(id)}/withdraw`, { reason }),
};
