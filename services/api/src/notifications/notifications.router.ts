import { MailPreferences, MailPreferencesPatch, MarkNotificationsRead, NotificationListQuery, NotificationPage } from '@localis/shared';
import { z } from 'zod';
import { access, defineRoutes } from '../http/route-registry';
import type { NotificationsService } from './notifications.service';
import { createNotificationsController } from './notifications.controller';

const UnreadCount = z.object({ unread: z.number().int() }).meta({ id: 'UnreadCount' });

/** Anyone signed in, whatever their roles, reads and keeps their own notifications. */
export function notificationsRoutes(service: NotificationsService) {
  const c = createNotificationsController(service);
  return defineRoutes([
    {
      method: 'get', path: '/me/notifications', tag: 'profile', summary: 'Your notifications, newest first (unread=true: only unread), with the unread count',
      access: access.read(), request: { query: NotificationListQuery },
      responses: { 200: { description: 'A page of notifications', schema: NotificationPage } }, handler: c.list,
    },
    {
      method: 'post', path: '/me/notifications/read', tag: 'profile', summary: 'Mark notifications read: some by id, or all',
      access: access.write(), request: { body: MarkNotificationsRead },
      responses: { 200: { description: 'How many stay unread', schema: UnreadCount } }, handler: c.markRead,
    },
    {
      method: 'get', path: '/me/mail-preferences', tag: 'profile', summary: 'Which optional mails you get (reviews asked of you and decisions always go out)',
      access: access.read(), responses: { 200: { description: 'Your mail settings', schema: MailPreferences } }, handler: c.mailPreferences,
    },
    {
      method: 'patch', path: '/me/mail-preferences', tag: 'profile', summary: 'Turn optional mails on or off',
      access: access.write(), request: { body: MailPreferencesPatch },
      responses: { 200: { description: 'Your mail settings', schema: MailPreferences } }, handler: c.updateMailPreferences,
    },
  ]);
}
