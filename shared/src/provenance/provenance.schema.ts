import { z } from 'zod';

/**
 * The provenance log: every verified archive, run, grant decision and analysis is one record, a
 * small W3C PROV-DM document (entities, activities, agents and the relations used,
 * wasGeneratedBy, wasAssociatedWith, wasDerivedFrom). Its canonical JSON is a leaf of a Merkle tree
 * hashed as in RFC 6962 section 2.1, so the log is tamper-evident: see provenance/merkle.ts.
 *
 * Identifiers are qualified names in the `localis:` namespace, e.g. `localis:archive/<uuid>`,
 * `localis:run/<uuid>`, `localis:person/<uuid>`, `localis:code/<name>@<version>`.
 */

export const PROVENANCE_NAMESPACE = 'https://localis.example.org/ns/provenance#';

export const PROVENANCE_KINDS = ['run-recorded', 'grant-decided', 'archive-verified', 'archive-withdrawn', 'analysis-computed', 'spot-check-computed'] as const;
export const ProvenanceKind = z.enum(PROVENANCE_KINDS);
export type ProvenanceKind = z.infer<typeof ProvenanceKind>;

const QualifiedName = z.string().regex(/^localis:[a-z-]+\/[^\s]+$/, 'a provenance id is localis:<type>/<id>');
const Attributes = z.record(z.string(), z.union([z.string(), z.number(), z.boolean()]));

export const ProvNode = z.object({ id: QualifiedName, label: z.string(), attributes: Attributes.default({}) }).strict();
export type ProvNode = z.infer<typeof ProvNode>;
export const ProvActivity = ProvNode.extend({ startedAt: z.string().optional(), endedAt: z.string().optional() }).strict();
export type ProvActivity = z.infer<typeof ProvActivity>;
export const ProvAgent = ProvNode.extend({ kind: z.enum(['person', 'software', 'organization']) }).strict();
export type ProvAgent = z.infer<typeof ProvAgent>;

export const ProvenanceRecord = z
  .object({
    v: z.literal(1),
    kind: ProvenanceKind,
    campaignId: z.uuid(),
    at: z.string(),
    entities: z.array(ProvNode),
    activities: z.array(ProvActivity),
    agents: z.array(ProvAgent),
    used: z.array(z.object({ activity: QualifiedName, entity: QualifiedName }).strict()),
    wasGeneratedBy: z.array(z.object({ entity: QualifiedName, activity: QualifiedName }).strict()),
    wasAssociatedWith: z.array(z.object({ activity: QualifiedName, agent: QualifiedName, role: z.string().optional() }).strict()),
    wasDerivedFrom: z.array(z.object({ generated: QualifiedName, used: QualifiedName }).strict()),
  })
  .strict()
  .meta({ id: 'ProvenanceRecord' });
export type ProvenanceRecord = z.infer<typeof ProvenanceRecord>;

const Hex32 = z.string().regex(/^[0-9a-f]{64}$/);

/** A tree head the server signed: the log had `treeSize` leaves with this root at `timestamp`. */
export const SignedTreeHead = z
  .object({
    treeSize: z.number().int().min(0),
    rootHash: Hex32,
    timestamp: z.string(),
    keyId: z.string(),
    /** Ed25519 signature, base64, over treeHeadMessage(). */
    signature: z.string(),
  })
  .meta({ id: 'SignedTreeHead' });
export type SignedTreeHead = z.infer<typeof SignedTreeHead>;

/** The bytes a tree head's signature covers. */
export function treeHeadMessage(h: Pick<SignedTreeHead, 'treeSize' | 'rootHash' | 'timestamp'>): string {
  return `localis-tree-head:v1\n${h.treeSize}\n${h.rootHash}\n${h.timestamp}`;
}

export const SigningKey = z.object({ keyId: z.string(), algorithm: z.literal('Ed25519'), publicKeyPem: z.string() }).meta({ id: 'SigningKey' });
export type SigningKey = z.infer<typeof SigningKey>;

export const ProvenanceEntry = z
  .object({
    id: z.string(),
    /** Position in the log; null until the entry is sequenced (moments after it is written). */
    leafIndex: z.number().int().nullable(),
    kind: ProvenanceKind,
    campaignId: z.uuid(),
    subjectId: z.string(),
    record: ProvenanceRecord,
    /** The exact bytes hashed into the leaf (canonical JSON of the record). */
    content: z.string(),
    leafHash: Hex32,
    createdAt: z.string(),
  })
  .meta({ id: 'ProvenanceEntry' });
export type ProvenanceEntry = z.infer<typeof ProvenanceEntry>;

export const InclusionProof = z
  .object({ leafIndex: z.number().int(), treeSize: z.number().int(), leafHash: Hex32, auditPath: z.array(Hex32), head: SignedTreeHead })
  .meta({ id: 'InclusionProof' });
export type InclusionProof = z.infer<typeof InclusionProof>;

export const ConsistencyProof = z
  .object({ firstSize: z.number().int(), secondSize: z.number().int(), path: z.array(Hex32), first: SignedTreeHead, second: SignedTreeHead })
  .meta({ id: 'ConsistencyProof' });
export type ConsistencyProof = z.infer<typeof ConsistencyProof>;

/** An entry with its inclusion proof in the latest head (null while not yet sequenced). */
export const ProvenanceEntryWithProof = z.object({ entry: ProvenanceEntry, proof: InclusionProof.nullable() }).meta({ id: 'ProvenanceEntryWithProof' });
export type ProvenanceEntryWithProof = z.infer<typeof ProvenanceEntryWithProof>;

export const ProvenanceEntryList = z.object({ items: z.array(ProvenanceEntry) }).meta({ id: 'ProvenanceEntryList' });
export type ProvenanceEntryList = z.infer<typeof ProvenanceEntryList>;

export const ProvenanceQuery = z.object({ format: z.enum(['entries', 'prov-json']).default('entries') });
export const ProofQuery = z.object({ treeSize: z.coerce.number().int().min(1).optional() });
export const ConsistencyQuery = z.object({
  from: z.coerce.number({ message: 'from is the size of the older head' }).int().min(1, 'from is at least 1'),
  to: z.coerce.number({ message: 'to is the size of the newer head' }).int().min(1).optional(),
});
export const LeafIndexParams = z.object({ index: z.coerce.number({ message: 'the leaf index is a whole number' }).int('the leaf index is a whole number').min(0, 'leaf indexes start at 0') });
export const Sha256Params = z.object({ sha256: Hex32 });

/** JSON with keys sorted at every level and no spaces: the same record always hashes the same. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    if (typeof value === 'number' && !Number.isFinite(value)) throw new Error('canonical JSON has no NaN or Infinity');
    return JSON.stringify(value);
  }
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const keys = Object.keys(value as Record<string, unknown>)
    .filter((k) => (value as Record<string, unknown>)[k] !== undefined)
    .sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson((value as Record<string, unknown>)[k])}`).join(',')}}`;
}
