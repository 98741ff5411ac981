import {
  errors,
  OPTIONAL_MAIL_KINDS,
  type MailPreferences,
  type MailPreferencesPatch,
  type MarkNotificationsRead,
  type NotificationListQuery,
  type NotificationPage,
} from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { auditService } from '../audit/audit.service';
import { notificationsRepository } from './notifications.repository';

/** Notification ids are bigserial; a longer number can match no row, and PostgreSQL would refuse it. */
const MAX_ID = 9_223_372_036_854_775_807n;
const possibleId = (id: string) => id.length <= 19 && BigInt(id) <= MAX_ID;

/** Every optional kind with its setting: stored `false` is off, anything else (or nothing) is on. */
function preferencesFrom(stored: Record<string, boolean>): MailPreferences {
  return Object.fromEntries(OPTIONAL_MAIL_KINDS.map((k) => [k, stored[k] !== false])) as MailPreferences;
}

/** The signed-in person's notifications and which optional mails they get. */
export function createNotificationsService(db: Database) {
  const me = (ctx: RequestContext) => ctx.principal!.personId;

  return {
    list(ctx: RequestContext, q: NotificationListQuery): Promise<NotificationPage> {
      return notificationsRepository.list(me(ctx), q);
    },

    /** Marks the caller's own notifications read; ids of anyone else's change nothing. */
    async markRead(ctx: RequestContext, body: MarkNotificationsRead): Promise<{ unread: number }> {
      const which = body.all ? 'all' : { ids: (body.ids ?? []).filter(possibleId) };
      await notificationsRepository.markRead(me(ctx), which);
      return { unread: await notificationsRepository.countUnread(me(ctx)) };
    },

    async mailPreferences(ctx: RequestContext): Promise<MailPreferences> {
      const stored = await notificationsRepository.mailPreferencesOf(me(ctx));
      if (!stored) throw errors.notFound('Your account');
      return preferencesFrom(stored);
    },

    updateMailPreferences(ctx: RequestContext, patch: MailPreferencesPatch): Promise<MailPreferences> {
      const id = me(ctx);
      return db.transaction(async (tx) => {
        // The row lock keeps two tabs saving at once from losing one of the changes.
        const stored = await notificationsRepository.mailPreferencesOf(id, tx, true);
        if (!stored) throw errors.notFound('Your account');
        const before = preferencesFrom(stored);
        const after: MailPreferences = { ...before, ...patch };
        const changes = Object.fromEntries(
          OPTIONAL_MAIL_KINDS.filter((k) => before[k] !== after[k]).map((k) => [k, { from: before[k], to: after[k] }]),
        );
        if (Object.keys(changes).length) {
          await notificationsRepository.setMailPreferences(id, after, tx);
          await auditService.record(ctx, 'mail-preferences.updated', { type: 'person', id }, changes, tx);
        }
        return after;
      });
    },
  };
}
export type NotificationsService = ReturnType<typeof createNotificationsService>;
