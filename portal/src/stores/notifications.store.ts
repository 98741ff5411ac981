import type { MailPreferences, Notification, OptionalMailKind } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { notificationsApi } from '../api/notifications.api';
import { isAbort, latestOnly } from './latest-only';

/** The bell lists at most this many unread notifications; the count covers them all. */
export const UNREAD_SHOWN = 20;

export const useNotificationsStore = defineStore('notifications', () => {
  /** The newest unread notifications, for the bell's list. */
  const unread = ref<Notification[]>([]);
  /** How many are unread in all (may exceed the list). */
  const unreadCount = ref(0);
  const loaded = ref(false);
  const preferences = ref<MailPreferences | null>(null);
  const reads = latestOnly();

  async function loadUnread(): Promise<void> {
    const { signal, isCurrent } = reads.begin();
    try {
      const page = await notificationsApi.list({ unread: 'true', limit: UNREAD_SHOWN }, signal);
      if (!isCurrent()) return;
      unread.value = page.items;
      unreadCount.value = page.unread;
      loaded.value = true;
    } catch (error) {
      if (isAbort(error)) return;
      throw error;
    }
  }

  async function markRead(ids: string[]): Promise<void> {
    if (ids.length === 0) return;
    const { unread: left } = await notificationsApi.markRead(ids);
    unread.value = unread.value.filter((n) => !ids.includes(n.id));
    unreadCount.value = left;
  }

  async function markAllRead(): Promise<void> {
    const { unread: left } = await notificationsApi.markAllRead();
    unread.value = [];
    unreadCount.value = left;
  }

  async function loadPreferences(): Promise<MailPreferences> {
    preferences.value = await notificationsApi.mailPreferences();
    return preferences.value;
  }

  /** Turns one optional mail on or off; the server's answer is what the switches then show. */
  async function setPreference(kind: OptionalMailKind, on: boolean): Promise<MailPreferences> {
    preferences.value = await notificationsApi.updateMailPreferences({ [kind]: on });
    return preferences.value;
  }

  return { unread, unreadCount, loaded, preferences, loadUnread, markRead, markAllRead, loadPreferences, setPreference };
});
