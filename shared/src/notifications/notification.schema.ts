import { z } from 'zod';

/** Events people hear about, by e-mail and in the portal. */
export const NOTIFICATION_KINDS = ['proposal-submitted', 'review-assigned', 'decision', 'usage-threshold', 'round-closing'] as const;
export const NotificationKind = z.enum(NOTIFICATION_KINDS);
export type NotificationKind = z.infer<typeof NotificationKind>;

/**
 * Mails a person may turn off. Review assignments and decisions always go out: they ask for
 * work or report an outcome that nobody should miss.
 */
export const OPTIONAL_MAIL_KINDS = ['proposal-submitted', 'usage-threshold', 'round-closing'] as const satisfies readonly NotificationKind[];
export type OptionalMailKind = (typeof OPTIONAL_MAIL_KINDS)[number];

export const NOTIFICATION_KIND_LABELS: Record<NotificationKind, string> = {
  'proposal-submitted': 'A proposal of your group (or, for the office, any proposal) is submitted',
  'review-assigned': 'A proposal is assigned to you for review',
  decision: 'The office decides on your proposal',
  'usage-threshold': "A grant you hold reaches 75 %, 90 % or 100 % use",
  'round-closing': 'An allocation round closes in 14 days',
};

export const Notification = z
  .object({
    id: z.string(),
    kind: NotificationKind,
    title: z.string(),
    body: z.string(),
    /** A path inside the portal, e.g. /campaigns/<id>. */
    link: z.string().nullable(),
    readAt: z.iso.datetime().nullable(),
    createdAt: z.iso.datetime(),
  })
  .meta({ id: 'Notification' });
export type Notification = z.infer<typeof Notification>;

export const NotificationListQuery = z.object({
  unread: z.enum(['true', 'false', '1', '0']).transform((v) => v === 'true' || v === '1').optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});
export type NotificationListQuery = z.infer<typeof NotificationListQuery>;

export const NotificationPage = z
  .object({ items: z.array(Notification), total: z.number().int(), unread: z.number().int(), limit: z.number().int(), offset: z.number().int() })
  .meta({ id: 'NotificationPage' });
export type NotificationPage = z.infer<typeof NotificationPage>;

export const MarkNotificationsRead = z
  .object({ ids: z.array(z.string().regex(/^\d+$/, 'notification ids are numbers')).max(500).optional(), all: z.literal(true).optional() })
  .strict()
  .refine((b) => b.ids !== undefined || b.all, 'give ids, or all: true')
  .meta({ id: 'MarkNotificationsRead' });
export type MarkNotificationsRead = z.infer<typeof MarkNotificationsRead>;

export const MailPreferences = z
  .object(Object.fromEntries(OPTIONAL_MAIL_KINDS.map((k) => [k, z.boolean()])) as Record<OptionalMailKind, z.ZodBoolean>)
  .strict()
  .meta({ id: 'MailPreferences' });
export type MailPreferences = z.infer<typeof MailPreferences>;

export const MailPreferencesPatch = MailPreferences.partial().strict().meta({ id: 'MailPreferencesPatch' });
export type MailPreferencesPatch = z.infer<typeof MailPreferencesPatch>;
