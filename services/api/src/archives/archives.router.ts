import { Archive, ArchiveList, ArchiveUpload, CompleteArchiveRequest, CreateArchiveRequest, DownloadLink, IdParams, PartUrls, PartUrlsRequest, StoredParts, WithdrawArchiveRequest } from '@localis/shared';
import { access, defineRoutes, type Access } from '../http/route-registry';
import type { ArchivesService } from './archives.service';
import { createArchivesController } from './archives.controller';

const READERS = ['researcher', 'pi', 'committee', 'admin'] as const;
const UPLOADERS = ['researcher', 'pi', 'admin'] as const;
/** Uploading is its own token scope: a pipeline's token can send archives and nothing else. */
const upload: Access = { kind: 'signed-in', scope: 'archives', roles: [...UPLOADERS] };

export function archivesRoutes(service: ArchivesService) {
  const c = createArchivesController(service);
  return defineRoutes([
    {
      method: 'post', path: '/campaigns/:id/archives', tag: 'archives', summary: 'Start uploading a result archive (or a proposal attachment): the answer says how to cut the file into parts',
      access: upload, request: { params: IdParams, body: CreateArchiveRequest }, responses: { 201: { description: 'The archive, uploading', schema: ArchiveUpload } }, handler: c.create,
    },
    {
      method: 'get', path: '/campaigns/:id/archives', tag: 'archives', summary: "A campaign's archives and attachments, newest first, with their states",
      access: access.read([...READERS]), request: { params: IdParams }, responses: { 200: { description: 'The archives', schema: ArchiveList } }, handler: c.list,
    },
    {
      method: 'get', path: '/archives/:id', tag: 'archives', summary: 'An archive: its state, problems when rejected, manifest when verified',
      access: access.read([...READERS]), request: { params: IdParams }, responses: { 200: { description: 'The archive', schema: Archive } }, handler: c.get,
    },
    {
      method: 'get', path: '/archives/:id/parts', tag: 'archives', summary: 'The parts the store holds already (a resumed upload sends only the others)',
      access: access.read([...READERS]), request: { params: IdParams }, responses: { 200: { description: 'Stored parts', schema: StoredParts } }, handler: c.storedParts,
    },
    {
      method: 'post', path: '/archives/:id/part-urls', tag: 'archives', summary: 'Presigned URLs (15 minutes) to PUT parts straight to the store',
      access: upload, request: { params: IdParams, body: PartUrlsRequest }, responses: { 200: { description: 'One URL per part', schema: PartUrls } }, handler: c.partUrls,
    },
    {
      method: 'post', path: '/archives/:id/complete', tag: 'archives', summary: "Every part sent: the store assembles the file and the worker checks it against the uploader's SHA-256",
      access: upload, request: { params: IdParams, body: CompleteArchiveRequest }, responses: { 200: { description: 'The archive, received', schema: Archive } }, handler: c.complete,
    },
    {
      method: 'post', path: '/archives/:id/cancel', tag: 'archives', summary: 'Give up an unfinished upload: its parts are dropped and the archive ends rejected (cancelled)',
      access: upload, request: { params: IdParams }, responses: { 200: { description: 'The archive, rejected', schema: Archive } }, handler: c.cancel,
    },
    {
      method: 'get', path: '/archives/:id/download', tag: 'archives', summary: 'A presigned download URL valid for 15 minutes',
      access: access.read([...READERS]), request: { params: IdParams }, responses: { 200: { description: 'The URL', schema: DownloadLink } }, handler: c.download,
    },
    {
      method: 'post', path: '/archives/:id/withdraw', tag: 'archives', summary: 'Withdraw a checked archive with a reason (the PI or the office); it stays stored and in the provenance log',
      access: access.write(['pi', 'admin']), request: { params: IdParams, body: WithdrawArchiveRequest }, responses: { 200: { description: 'The archive, withdrawn', schema: Archive } }, handler: c.withdraw,
    },
  ]);
}
