import type { MailPreferences, MailPreferencesPatch, NotificationPage } from '@localis/shared';
import { http, type QueryParams } from './http-client';

/** Query of GET /me/notifications as the portal sends it. */
export interface NotificationsQuery extends QueryParams {
  /** 'true': only those not read yet. */
  unread?: string;
  limit?: number;
  offset?: number;
}

export const notificationsApi = {
  list: (query: NotificationsQuery, signal?: AbortSignal) => http.get<NotificationPage>('/me/notifications', query, signal),
  /** Marks some (by id) or all as read; answers how many stay unread. */
  markRead: (ids: string[]) => http.post<{ unread: number }>('/me/notifications/read', { ids }),
  markAllRead: () => http.post<{ unread: number }>('/me/notifications/read', { all: true }),
  mailPreferences: () => http.get<MailPreferences>('/me/mail-preferences'),
  updateMailPreferences: (patch: MailPreferencesPatch) => http.patch<MailPreferences>('/me/mail-preferences', patch),
};
