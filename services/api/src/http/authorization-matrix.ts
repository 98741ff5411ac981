import { randomUUID } from 'node:crypto';

/**
 * The authorization matrix: every route x every kind of caller -> the status it must get.
 * `authorization-matrix.test.ts` runs it against the real app and fails when a route exists
 * that this table does not list. Later features add their rows here.
 */
export const ACTORS = ['anonymous', 'researcher', 'pi', 'committee', 'admin', 'billing', 'otherGroupPi'] as const;
export type Actor = (typeof ACTORS)[number];

/** The records the rows point at, made fresh for each run. */
export interface Fixtures {
  institutionA: string;
  /** A partner institution, whose billing contact is the billing actor. */
  partnerId: string;
  /** A draft invoice of the partner, that rows read. */
  invoiceId: string;
  /** A new draft invoice of the partner. */
  freshDraftInvoice(): Promise<string>;
  /** An issued invoice of the partner (with its payment page). */
  issuedInvoiceId: string;
  /** Ends any open invoice run, so a row may start one. */
  closeInvoiceRuns(): Promise<void>;
  groupA: string;
  researcherId: string;
  piId: string;
  /** A person the rows change (roles, membership); never an actor. */
  extraId: string;
  tokenIdOf(actor: Actor): Promise<string>;
  addExtraToGroupA(): Promise<void>;
  /** An open round with a pool on MATRIX_MACHINE. */
  roundId: string;
  /** A draft of group A, owned by the researcher, that rows only read. */
  draftId: string;
  /** A new draft of group A owned by the researcher, for rows that change it. */
  freshDraft(): Promise<string>;
  /** A new proposal of group A, submitted by its PI. */
  freshSubmitted(): Promise<string>;
  /** A proposal of group A, submitted once, that rows only read. */
  submittedId: string;
  /** The committee actor, who is from another institution than group A (no conflict). */
  committeeId: string;
  /** A granted campaign of group A that rows read and charge small amounts to. */
  grantedId: string;
  /** A new granted campaign of group A. */
  freshGranted(): Promise<string>;
  /** A new proposal of group A in review, with the committee actor assigned. */
  freshAssignment(): Promise<{ campaignId: string; assignmentId: string }>;
  /** A run of the granted campaign, recorded by its PI. */
  freshRun(): Promise<string>;
  /** An archive of the granted campaign, still uploading (no parts sent), that rows read. */
  uploadingArchiveId: string;
  /** An analysis of the granted campaign (queued), that rows read. */
  analysisId: string;
  /** A new archive of the granted campaign, uploading. */
  freshUploadingArchive(): Promise<string>;
  /** The size of the provenance log's latest signed head (a head that exists). */
  latestTreeSize(): Promise<number>;
  /** Scratch space for rows that prepare records in `before`. */
  scratch: Record<string, string>;
}

export const MATRIX_MACHINE = 'matrix-cluster';

/** A small valid campaign specification (3D transfer-matrix around the known critical point). */
export const MATRIX_SPEC = {
  model: 'anderson-box', dimension: 3, symmetryClass: 'AI', sizes: [4, 6, 8], disorder: { from: 15, to: 18, step: 0.5 },
  energies: [0], realizations: 1, method: 'transfer-matrix', targetPrecision: 0.01, node: { coresPerNode: 64, memoryGiBPerNode: 256 },
};

export interface MatrixRow {
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** The route as registered (Express syntax). */
  route: string;
  /** The concrete request path for an actor. */
  path: (f: Fixtures, actor: Actor) => string | Promise<string>;
  body?: (f: Fixtures) => unknown;
  before?: (f: Fixtures) => Promise<void>;
  /** A POST that changes nothing (an estimate): a read-only token may make it. */
  readOnly?: boolean;
  /** Signs in afresh for this row (sign-out would end the shared session). */
  freshSession?: boolean;
  expect: Record<Actor, number>;
}

const all = (status: number): Record<Actor, number> => Object.fromEntries(ACTORS.map((a) => [a, status])) as Record<Actor, number>;
const signedIn = (status: number) => ({ ...all(status), anonymous: 401 });
const only = (status: number, allowed: Actor[], others = 403) => ({
  ...signedIn(others),
  ...Object.fromEntries(allowed.map((a) => [a, status])),
});

const fixed = (p: string) => () => p;
/** Rate cards change forward in time: each row's card starts a day after the one before. */
let rateCardDays = 0;
const nextRateCardDay = () => new Date(Date.UTC(2031, 0, 1 + rateCardDays++)).toISOString().slice(0, 10);

/** A tiny run with a job id of its own, so every request records a new one. */
const tinyRun = () => ({
  externalJobId: `matrix-${randomUUID()}`, machine: MATRIX_MACHINE, startedAt: '2027-02-01T08:00:00Z', endedAt: '2027-02-01T08:00:36Z',
  cores: 1, codeName: 'tmm-bar', codeVersion: 'matrix', parameters: { sizes: [4], disorder: [16.5], energies: [0], seeds: [1] },
});
const tinyImport = () => ({ csv: `JobID,Start,End,AllocCPUS\r\nmatrix-${randomUUID()},2027-02-01T08:00:00,2027-02-01T08:00:36,1\r\n`, defaults: { codeName: 'tmm-bar', codeVersion: 'matrix' } });
const MATRIX_REVIEW = { scores: { merit: 4, feasibility: 4, costJustification: 3 }, toProposers: 'A sound plan; the sizes are well chosen.', confidential: '', recommendedCoreHours: 1 };
// The group's campaigns: its members and the office see them, the committee once submitted, other groups never.
const groupReaders = { ...only(200, ['researcher', 'pi', 'committee', 'admin']), otherGroupPi: 404 };
const groupRecorders = (status: number) => ({ ...only(status, ['researcher', 'pi', 'admin']), otherGroupPi: 404 });
const groupReadersWith = (status: number) => ({ ...only(status, ['researcher', 'pi', 'committee', 'admin']), otherGroupPi: 404 });

export const MATRIX: MatrixRow[] = [
  { method: 'GET', route: '/healthz', path: fixed('/healthz'), expect: all(200) },
  { method: 'GET', route: '/readyz', path: fixed('/readyz'), expect: all(200) },
  { method: 'GET', route: '/api/v1/openapi.json', path: fixed('/api/v1/openapi.json'), expect: all(200) },
  { method: 'GET', route: '/api/v1/session', path: fixed('/api/v1/session'), expect: all(200) },
  { method: 'GET', route: '/api/v1/auth/login', path: fixed('/api/v1/auth/login?redirect=/'), expect: all(302) },
  { method: 'GET', route: '/api/v1/auth/callback', path: fixed('/api/v1/auth/callback'), expect: all(302) },
  { method: 'POST', route: '/api/v1/auth/logout', path: fixed('/api/v1/auth/logout'), freshSession: true, expect: signedIn(200) },

  { method: 'GET', route: '/api/v1/me', path: fixed('/api/v1/me'), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/me/tokens', path: fixed('/api/v1/me/tokens'), expect: signedIn(200) },
  {
    method: 'POST', route: '/api/v1/me/tokens', path: fixed('/api/v1/me/tokens'),
    body: () => ({ name: 'matrix', scopes: ['read'], expiresInDays: 1 }), expect: signedIn(201),
  },
  {
    method: 'DELETE', route: '/api/v1/me/tokens/:id',
    path: async (f, actor) => `/api/v1/me/tokens/${actor === 'anonymous' ? randomUUID() : await f.tokenIdOf(actor)}`,
    expect: signedIn(204),
  },

  { method: 'GET', route: '/api/v1/people', path: fixed('/api/v1/people'), expect: only(200, ['admin']) },
  {
    method: 'POST', route: '/api/v1/people', path: fixed('/api/v1/people'),
    body: () => ({ name: 'Matrix Person', email: `matrix-${randomUUID().slice(0, 8)}@test.example`, roles: [] }), expect: only(201, ['admin']),
  },
  { method: 'GET', route: '/api/v1/people/:id', path: (f) => `/api/v1/people/${f.researcherId}`, expect: only(200, ['admin', 'researcher']) },
  { method: 'PATCH', route: '/api/v1/people/:id', path: (f) => `/api/v1/people/${f.extraId}`, body: () => ({ name: 'Matrix Extra' }), expect: only(200, ['admin']) },
  { method: 'PUT', route: '/api/v1/people/:id/roles/:role', path: (f) => `/api/v1/people/${f.extraId}/roles/billing`, expect: only(200, ['admin']) },
  { method: 'DELETE', route: '/api/v1/people/:id/roles/:role', path: (f) => `/api/v1/people/${f.extraId}/roles/billing`, expect: only(200, ['admin']) },

  { method: 'GET', route: '/api/v1/institutions', path: fixed('/api/v1/institutions'), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/institutions/:id', path: (f) => `/api/v1/institutions/${f.institutionA}`, expect: signedIn(200) },
  {
    method: 'POST', route: '/api/v1/institutions', path: fixed('/api/v1/institutions'),
    body: () => ({ name: `Matrix Institute ${randomUUID().slice(0, 8)}`, kind: 'partner', country: 'fr', billingEmail: 'billing@matrix.example' }),
    expect: only(201, ['admin']),
  },
  { method: 'PATCH', route: '/api/v1/institutions/:id', path: (f) => `/api/v1/institutions/${f.institutionA}`, body: () => ({ country: 'DE' }), expect: only(200, ['admin']) },
  { method: 'GET', route: '/api/v1/invoices', path: fixed('/api/v1/invoices'), expect: only(200, ['admin', 'billing']) },
  { method: 'GET', route: '/api/v1/invoices/:id', path: (f) => `/api/v1/invoices/${f.invoiceId}`, expect: only(200, ['admin', 'billing']) },
  // A draft has no PDF: the office and the partner's billing contact get past the checks to that answer.
  { method: 'GET', route: '/api/v1/invoices/:id/pdf', path: (f) => `/api/v1/invoices/${f.invoiceId}/pdf`, expect: only(409, ['admin', 'billing']) },
  { method: 'GET', route: '/api/v1/invoice-runs', path: fixed('/api/v1/invoice-runs'), expect: only(200, ['admin']) },
  { method: 'POST', route: '/api/v1/invoice-runs', path: fixed('/api/v1/invoice-runs'), before: (f) => f.closeInvoiceRuns(), body: () => ({ from: '2031-01-01', to: '2031-01-31' }), expect: only(202, ['admin']) },
  { method: 'POST', route: '/api/v1/invoices/:id/issue', path: async (f) => `/api/v1/invoices/${await f.freshDraftInvoice()}/issue`, expect: only(200, ['admin']) },
  { method: 'POST', route: '/api/v1/invoices/:id/void', path: async (f) => `/api/v1/invoices/${await f.freshDraftInvoice()}/void`, body: () => ({ reason: 'matrix' }), expect: only(200, ['admin']) },
  { method: 'POST', route: '/api/v1/invoices/:id/pay', path: (f) => `/api/v1/invoices/${f.issuedInvoiceId}/pay`, expect: only(200, ['admin', 'billing']) },
  // Public, proven by Stripe's signature: without one, every caller gets 400.
  { method: 'POST', route: '/api/v1/webhooks/stripe', path: fixed('/api/v1/webhooks/stripe'), body: () => ({ id: 'evt_unsigned', type: 'invoice.paid' }), expect: all(400) },
  { method: 'GET', route: '/api/v1/institutions/:id/rate-cards', path: (f) => `/api/v1/institutions/${f.partnerId}/rate-cards`, expect: only(200, ['admin', 'billing']) },
  {
    method: 'POST', route: '/api/v1/institutions/:id/rate-cards', path: (f) => `/api/v1/institutions/${f.partnerId}/rate-cards`,
    body: () => ({ currency: 'EUR', unitPriceMinor: 12, taxRateBasisPoints: 2100, effectiveFrom: nextRateCardDay() }), expect: only(201, ['admin']),
  },

  { method: 'GET', route: '/api/v1/groups', path: fixed('/api/v1/groups'), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/groups/:id', path: (f) => `/api/v1/groups/${f.groupA}`, expect: only(200, ['admin', 'pi', 'researcher']) },
  {
    method: 'POST', route: '/api/v1/groups', path: fixed('/api/v1/groups'),
    body: (f) => ({ name: `Matrix Group ${randomUUID().slice(0, 8)}`, institutionId: f.institutionA, piPersonId: f.piId }), expect: only(201, ['admin']),
  },
  {
    method: 'POST', route: '/api/v1/groups/:id/members', path: (f) => `/api/v1/groups/${f.groupA}/members`,
    body: (f) => ({ personId: f.extraId }), expect: only(200, ['admin', 'pi']),
  },
  {
    method: 'DELETE', route: '/api/v1/groups/:id/members/:personId', path: (f) => `/api/v1/groups/${f.groupA}/members/${f.extraId}`,
    before: (f) => f.addExtraToGroupA(), expect: only(200, ['admin', 'pi']),
  },

  { method: 'GET', route: '/api/v1/audit', path: fixed('/api/v1/audit'), expect: only(200, ['admin']) },

  { method: 'GET', route: '/api/v1/rounds', path: fixed('/api/v1/rounds'), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/rounds/:id', path: (f) => `/api/v1/rounds/${f.roundId}`, expect: signedIn(200) },
  {
    method: 'POST', route: '/api/v1/rounds', path: fixed('/api/v1/rounds'),
    body: () => ({ name: `Matrix round ${randomUUID().slice(0, 8)}`, opensAt: '2026-01-01T00:00:00Z', closesAt: '2099-01-01T00:00:00Z', pools: [{ machine: 'matrix-b', coreHours: 1000 }] }),
    expect: only(201, ['admin']),
  },
  {
    method: 'PATCH', route: '/api/v1/rounds/:id', path: (f) => `/api/v1/rounds/${f.roundId}`,
    body: () => ({ pools: [{ machine: MATRIX_MACHINE, coreHours: 5_000_000 }] }), expect: only(200, ['admin']),
  },

  { method: 'POST', route: '/api/v1/estimates', path: fixed('/api/v1/estimates'), body: () => MATRIX_SPEC, readOnly: true, expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/campaigns', path: fixed('/api/v1/campaigns'), expect: only(200, ['researcher', 'pi', 'committee', 'admin', 'otherGroupPi']) },
  {
    method: 'POST', route: '/api/v1/campaigns', path: fixed('/api/v1/campaigns'),
    body: (f) => ({ title: 'Matrix campaign', abstract: 'A campaign the authorization matrix drafts.', groupId: f.groupA, roundId: f.roundId, machine: MATRIX_MACHINE, spec: MATRIX_SPEC }),
    // Only members of group A may draft in it; the other group's PI is refused by the service.
    expect: only(201, ['researcher', 'pi']),
  },
  // Drafts are seen by their group and the office only; to others they do not exist.
  { method: 'GET', route: '/api/v1/campaigns/:id', path: (f) => `/api/v1/campaigns/${f.draftId}`, expect: { ...only(200, ['researcher', 'pi', 'admin']), committee: 404, otherGroupPi: 404 } },
  // Once submitted, the committee reads it too.
  { method: 'GET', route: '/api/v1/campaigns/:id', path: (f) => `/api/v1/campaigns/${f.submittedId}`, expect: { ...only(200, ['researcher', 'pi', 'admin', 'committee']), otherGroupPi: 404 } },
  {
    method: 'PATCH', route: '/api/v1/campaigns/:id', path: (f) => f.freshDraft().then((id) => `/api/v1/campaigns/${id}`),
    body: () => ({ title: 'Matrix campaign, edited' }), expect: { ...only(200, ['researcher', 'pi']), otherGroupPi: 404 },
  },
  {
    method: 'POST', route: '/api/v1/campaigns/:id/submit', path: (f) => f.freshDraft().then((id) => `/api/v1/campaigns/${id}/submit`),
    expect: { ...only(200, ['pi']), otherGroupPi: 404 },
  },
  {
    method: 'POST', route: '/api/v1/campaigns/:id/withdraw', path: (f) => f.freshDraft().then((id) => `/api/v1/campaigns/${id}/withdraw`),
    body: () => ({ note: 'withdrawn by the matrix' }), expect: { ...only(200, ['researcher', 'pi']), otherGroupPi: 404 },
  },
  {
    method: 'POST', route: '/api/v1/campaigns/:id/start-review', path: (f) => f.freshSubmitted().then((id) => `/api/v1/campaigns/${id}/start-review`),
    expect: only(200, ['admin']),
  },

  { method: 'GET', route: '/api/v1/me/notifications', path: fixed('/api/v1/me/notifications'), expect: signedIn(200) },
  { method: 'POST', route: '/api/v1/me/notifications/read', path: fixed('/api/v1/me/notifications/read'), body: () => ({ all: true }), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/me/mail-preferences', path: fixed('/api/v1/me/mail-preferences'), expect: signedIn(200) },
  { method: 'PATCH', route: '/api/v1/me/mail-preferences', path: fixed('/api/v1/me/mail-preferences'), body: () => ({ 'round-closing': true }), expect: signedIn(200) },

  { method: 'GET', route: '/api/v1/committee/queue', path: fixed('/api/v1/committee/queue?scope=all'), expect: only(200, ['committee', 'admin']) },
  { method: 'GET', route: '/api/v1/campaigns/:id/reviews', path: (f) => `/api/v1/campaigns/${f.submittedId}/reviews`, expect: groupReaders },
  {
    method: 'POST', route: '/api/v1/campaigns/:id/assignments', path: (f) => f.freshSubmitted().then((id) => `/api/v1/campaigns/${id}/assignments`),
    body: (f) => ({ reviewerPersonId: f.committeeId }), expect: only(201, ['admin']),
  },
  {
    method: 'DELETE', route: '/api/v1/campaigns/:id/assignments/:assignmentId',
    path: (f) => f.freshAssignment().then((a) => `/api/v1/campaigns/${a.campaignId}/assignments/${a.assignmentId}`), expect: only(204, ['admin']),
  },
  {
    method: 'POST', route: '/api/v1/campaigns/:id/conflict', path: (f) => f.freshSubmitted().then((id) => `/api/v1/campaigns/${id}/conflict`),
    body: () => ({ reason: 'co-author of the PI last year' }), expect: only(200, ['committee']),
  },
  {
    method: 'PUT', route: '/api/v1/campaigns/:id/assignments/:assignmentId/review',
    path: (f) => f.freshAssignment().then((a) => `/api/v1/campaigns/${a.campaignId}/assignments/${a.assignmentId}/review`), body: () => MATRIX_REVIEW, expect: only(200, ['committee']),
  },
  { method: 'GET', route: '/api/v1/campaigns/:id/pool', path: (f) => `/api/v1/campaigns/${f.submittedId}/pool`, expect: only(200, ['committee', 'admin']) },
  {
    method: 'POST', route: '/api/v1/campaigns/:id/decision', path: (f) => f.freshSubmitted().then((id) => `/api/v1/campaigns/${id}/decision`),
    body: () => ({ outcome: 'decline', message: 'Declined by the authorization matrix.' }), expect: only(200, ['admin']),
  },
  { method: 'GET', route: '/api/v1/rounds/:id/usage', path: (f) => `/api/v1/rounds/${f.roundId}/usage`, expect: only(200, ['committee', 'admin']) },

  { method: 'GET', route: '/api/v1/campaigns/:id/ledger', path: (f) => `/api/v1/campaigns/${f.grantedId}/ledger`, expect: groupReaders },
  {
    method: 'POST', route: '/api/v1/campaigns/:id/ledger/adjustments', path: (f) => `/api/v1/campaigns/${f.grantedId}/ledger/adjustments`,
    body: () => ({ coreHours: 1, reason: 'matrix top-up' }), expect: only(201, ['admin']),
  },
  {
    method: 'POST', route: '/api/v1/campaigns/:id/ledger/transfers',
    before: async (f) => {
      f.scratch.transferFrom = await f.freshGranted();
      f.scratch.transferTo = await f.freshGranted();
    },
    path: (f) => `/api/v1/campaigns/${f.scratch.transferFrom}/ledger/transfers`,
    body: (f) => ({ toCampaignId: f.scratch.transferTo, coreHours: 0.001, reason: 'matrix transfer' }),
    expect: { ...only(201, ['pi', 'admin']), otherGroupPi: 404 },
  },
  {
    method: 'POST', route: '/api/v1/campaigns/:id/ledger/refunds',
    before: async (f) => {
      f.scratch.refundRun = await f.freshRun();
    },
    path: (f) => `/api/v1/campaigns/${f.grantedId}/ledger/refunds`, body: (f) => ({ runId: f.scratch.refundRun, reason: 'node failure' }), expect: only(201, ['admin']),
  },
  { method: 'GET', route: '/api/v1/campaigns/:id/runs', path: (f) => `/api/v1/campaigns/${f.grantedId}/runs`, expect: groupReaders },
  { method: 'POST', route: '/api/v1/campaigns/:id/runs', path: (f) => `/api/v1/campaigns/${f.grantedId}/runs`, body: () => tinyRun(), expect: groupRecorders(201) },
  { method: 'POST', route: '/api/v1/campaigns/:id/runs/import', path: (f) => `/api/v1/campaigns/${f.grantedId}/runs/import?dryRun=true`, body: () => tinyImport(), expect: groupRecorders(200) },
  { method: 'POST', route: '/api/v1/campaigns/:id/runs/import', path: (f) => `/api/v1/campaigns/${f.grantedId}/runs/import`, body: () => tinyImport(), expect: groupRecorders(201) },

  { method: 'GET', route: '/api/v1/campaigns/:id/archives', path: (f) => `/api/v1/campaigns/${f.grantedId}/archives`, expect: groupReaders },
  {
    method: 'POST', route: '/api/v1/campaigns/:id/archives', path: (f) => `/api/v1/campaigns/${f.grantedId}/archives`,
    body: () => ({ kind: 'results', fileName: 'matrix.tar.gz', sizeBytes: 20_000_000 }), expect: groupRecorders(201),
  },
  { method: 'GET', route: '/api/v1/archives/:id', path: (f) => `/api/v1/archives/${f.uploadingArchiveId}`, expect: groupReaders },
  { method: 'GET', route: '/api/v1/archives/:id/parts', path: (f) => `/api/v1/archives/${f.uploadingArchiveId}/parts`, expect: groupReaders },
  { method: 'POST', route: '/api/v1/archives/:id/part-urls', path: (f) => `/api/v1/archives/${f.uploadingArchiveId}/part-urls`, body: () => ({ partNumbers: [1, 2] }), expect: groupRecorders(200) },
  // No part was sent: the uploaders get past the door and are told what is missing.
  { method: 'POST', route: '/api/v1/archives/:id/complete', path: (f) => `/api/v1/archives/${f.uploadingArchiveId}/complete`, body: () => ({ sha256: 'a'.repeat(64) }), expect: groupRecorders(409) },
  { method: 'POST', route: '/api/v1/archives/:id/cancel', before: async (f) => { f.scratch.cancelArchive = await f.freshUploadingArchive(); }, path: (f) => `/api/v1/archives/${f.scratch.cancelArchive}/cancel`, expect: groupRecorders(200) },
  // Still uploading: the readers get past the door and are told it cannot be downloaded yet.
  { method: 'GET', route: '/api/v1/archives/:id/download', path: (f) => `/api/v1/archives/${f.uploadingArchiveId}/download`, expect: groupReadersWith(409) },
  {
    method: 'POST', route: '/api/v1/archives/:id/withdraw', path: (f) => `/api/v1/archives/${f.uploadingArchiveId}/withdraw`,
    body: () => ({ reason: 'withdrawn by the authorization matrix' }), expect: { ...only(409, ['pi', 'admin']), otherGroupPi: 404 },
  },

  { method: 'GET', route: '/api/v1/campaigns/:id/analyses', path: (f) => `/api/v1/campaigns/${f.grantedId}/analyses`, expect: groupReaders },
  { method: 'GET', route: '/api/v1/analyses/:id', path: (f) => `/api/v1/analyses/${f.analysisId}`, expect: groupReaders },
  { method: 'POST', route: '/api/v1/campaigns/:id/analyses', path: (f) => `/api/v1/campaigns/${f.grantedId}/analyses`, body: () => ({ bootstrap: 0 }), expect: groupRecorders(202) },
  { method: 'GET', route: '/api/v1/campaigns/:id/spot-checks', path: (f) => `/api/v1/campaigns/${f.grantedId}/spot-checks`, expect: groupReaders },

  { method: 'GET', route: '/api/v1/provenance/head', path: fixed('/api/v1/provenance/head'), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/provenance/key', path: fixed('/api/v1/provenance/key'), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/provenance/entries/:index', path: fixed('/api/v1/provenance/entries/0'), expect: signedIn(200) },
  { method: 'GET', route: '/api/v1/provenance/consistency', path: async (f) => `/api/v1/provenance/consistency?from=${await f.latestTreeSize()}`, expect: signedIn(200) },
  // No verified archive has this hash: the readers are let through and find nothing.
  { method: 'GET', route: '/api/v1/provenance/archives/:sha256', path: fixed(`/api/v1/provenance/archives/${'0'.repeat(64)}`), expect: { ...only(404, ['researcher', 'pi', 'committee', 'admin', 'otherGroupPi']) } },
  { method: 'GET', route: '/api/v1/campaigns/:id/provenance', path: (f) => `/api/v1/campaigns/${f.grantedId}/provenance`, expect: groupReaders },
  { method: 'GET', route: '/api/v1/campaigns/:id/provenance', path: (f) => `/api/v1/campaigns/${f.grantedId}/provenance?format=prov-json`, expect: groupReaders },
];
