/** BullMQ queue names: one place, so the api, the worker and tests agree. */
export const QUEUES = {
  mail: 'localis-mail',
  /** Hourly chores: round-closing notices and the expiry of ended allocations. */
  dailySweep: 'localis-daily-sweep',
  /** Checks an uploaded archive and records it in the provenance log. */
  verifyArchive: 'localis-verify-archive',
  /** Finite-size scaling analyses of a campaign's verified archives. */
  analyze: 'localis-analyze',
  /** Recomputes a few points of a verified archive with the transfer-matrix kernel. */
  spotCheck: 'localis-spot-check',
  /** Drafts partner invoices for a period from the ledger. */
  invoiceRun: 'localis-invoice-run',
  /** What follows an invoice's issue: its PDF, its payment page, the e-mail to the partner. */
  invoiceIssued: 'localis-invoice-issued',
  /** Gives new provenance entries their leaf indexes and signs a new tree head. */
  sequenceProvenance: 'localis-sequence-provenance',
} as const;
export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

/** Kinds of outbox messages the dispatcher hands to the queues. */
export const OUTBOX_KINDS = { mail: 'mail', verifyArchive: 'verify-archive', analyze: 'analyze', spotCheck: 'spot-check', invoiceRun: 'invoice-run', invoiceIssued: 'invoice-issued' } as const;
