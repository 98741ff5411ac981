import { ConsistencyProof, ConsistencyQuery, IdParams, LeafIndexParams, ProofQuery, ProvenanceEntryList, ProvenanceEntryWithProof, ProvenanceQuery, Sha256Params, SignedTreeHead, SigningKey } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { ProvenanceService } from './provenance.service';
import { createProvenanceController } from './provenance.controller';

const READERS = ['researcher', 'pi', 'committee', 'admin'] as const;

export function provenanceRoutes(service: ProvenanceService, archiveIdOf: (sha256: string) => Promise<string | null>) {
  const c = createProvenanceController(service, archiveIdOf);
  return defineRoutes([
    {
      method: 'get', path: '/provenance/head', tag: 'provenance', summary: "The provenance log's latest signed tree head (RFC 6962 Merkle tree, Ed25519 signature)",
      access: access.read(), responses: { 200: { description: 'The signed tree head', schema: SignedTreeHead } }, handler: c.head,
    },
    {
      method: 'get', path: '/provenance/key', tag: 'provenance', summary: 'The public key that signs tree heads',
      access: access.read(), responses: { 200: { description: 'The key', schema: SigningKey } }, handler: c.key,
    },
    {
      method: 'get', path: '/provenance/entries/:index', tag: 'provenance', summary: 'A log entry by leaf index, with its inclusion proof in the latest head (or in the head of treeSize)',
      access: access.read(), request: { params: LeafIndexParams, query: ProofQuery }, responses: { 200: { description: 'Entry and proof', schema: ProvenanceEntryWithProof } }, handler: c.entry,
    },
    {
      method: 'get', path: '/provenance/consistency', tag: 'provenance', summary: 'A consistency proof between two signed heads (from a saved head to the latest, or to the head of size `to`)',
      access: access.read(), request: { query: ConsistencyQuery }, responses: { 200: { description: 'The proof with both heads', schema: ConsistencyProof } }, handler: c.consistency,
    },
    {
      method: 'get', path: '/provenance/archives/:sha256', tag: 'provenance', summary: "A verified archive's log entry by the file's SHA-256, with its inclusion proof",
      access: access.read([...READERS]), request: { params: Sha256Params }, responses: { 200: { description: 'Entry and proof', schema: ProvenanceEntryWithProof } }, handler: c.byArchiveSha256,
    },
    {
      method: 'get', path: '/campaigns/:id/provenance', tag: 'provenance', summary: "A campaign's provenance: its log entries, or (format=prov-json) a W3C PROV-JSON document",
      access: access.read([...READERS]), request: { params: IdParams, query: ProvenanceQuery }, responses: { 200: { description: 'Entries or PROV-JSON', schema: ProvenanceEntryList } }, handler: c.ofCampaign,
    },
  ]);
}
