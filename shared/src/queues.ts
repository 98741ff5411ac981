/** BullMQ queue names: one place, so the api, the worker and tests agree. */
export const QUEUES = {
  mail: 'localis-mail',
  /** Hourly chores: round-closing notices and the expiry of ended allocations. */
  dailySweep: 'localis-daily-sweep',
} as const;
export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

/** Kinds of outbox messages the dispatcher hands to the queues. */
export const OUTBOX_KINDS = { mail: 'mail' } as const;
