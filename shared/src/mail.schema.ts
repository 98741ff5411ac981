import { z } from 'zod';

/** A message the worker's mail job sends. Written to the outbox with the change that causes it. */
export const MailMessage = z.object({
  to: z.array(z.email()).min(1),
  subject: z.string().min(1).max(300),
  text: z.string().min(1),
  /** The same message as HTML, for mail readers that show it. */
  html: z.string().min(1).optional(),
  /** Files from the object store, attached by the mail job (an invoice's PDF). */
  attachments: z.array(z.object({ filename: z.string().min(1).max(200), objectKey: z.string().min(1), contentType: z.string().min(1) })).max(5).optional(),
  /** Makes the send idempotent: a retried job with the same key is not sent twice. */
  dedupeKey: z.string().min(1).max(200),
});
export type MailMessage = z.infer<typeof MailMessage>;
