import type { Notification } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { useSessionStore } from '../stores/session.store';
import { jsonResponse as json, notServed, stubFetch } from '../test/fetch-stub';
import { memoryRouter, mountInApp, resetTestPage } from '../test/mount-in-app';
import NotificationBell from './notification-bell.vue';

const note = (id: string, link: string | null): Notification => ({
  id,
  kind: 'usage-threshold',
  title: `Grant at 90 % (${id})`,
  body: 'Critical disorder of the 3D Anderson model has used 90 % of its grant.',
  link,
  readAt: null,
  createdAt: '2027-04-03T10:00:00.000Z',
});

let unread: Notification[];
let requests: { method: string; url: string; body: unknown }[];

function serve(url: string, init?: RequestInit): Response {
  const method = init?.method ?? 'GET';
  const body = init?.body ? (JSON.parse(String(init.body)) as { ids?: string[]; all?: boolean }) : undefined;
  requests.push({ method, url, body });
  if (url.startsWith('/api/v1/me/notifications?')) return json(200, { items: unread, total: unread.length, unread: unread.length, limit: 20, offset: 0 });
  if (url === '/api/v1/me/notifications/read') {
    unread = body?.all ? [] : unread.filter((n) => !body?.ids?.includes(n.id));
    return json(200, { unread: unread.length });
  }
  return notServed(url);
}

async function mountBell() {
  const router = memoryRouter([
    { path: '/', name: 'home' },
    { path: '/campaigns/:id/ledger', name: 'campaign-ledger' },
  ]);
  const wrapper = await mountInApp(NotificationBell, { router, beforeMount: () => (useSessionStore().signedIn = true) });
  return { wrapper, router, session: useSessionStore() };
}

const polls = () => requests.filter((r) => r.url.startsWith('/api/v1/me/notifications?')).length;

describe('NotificationBell', { timeout: 20_000 }, () => {
  beforeEach(() => {
    requests = [];
    unread = [note('7', '/campaigns/3a4b/ledger'), note('8', 'https://elsewhere.example/')];
    stubFetch(serve);
  });

  afterEach(resetTestPage);

  describe('the count', () => {
    it('should ask for unread notifications at once and show how many there are', async () => {
      const { wrapper } = await mountBell();
      expect(requests[0].url).toBe('/api/v1/me/notifications?unread=true&limit=20');
      expect(wrapper.get('[data-testid="notification-count"]').text()).toBe('2');
      expect(wrapper.get('[data-testid="notification-bell"]').attributes('aria-label')).toBe('Notifications, 2 unread');
    });

    it('should ask again on a route change and stop once signed out', async () => {
      const { router, session } = await mountBell();
      await router.push('/campaigns/x/ledger');
      await flushPromises();
      expect(polls()).toBe(2);
      session.signedIn = false;
      await flushPromises();
      await router.push('/');
      await flushPromises();
      expect(polls()).toBe(2);
    });
  });

  describe('the list', () => {
    it('should follow a link inside the portal and mark that notification read', async () => {
      const { wrapper, router } = await mountBell();
      await wrapper.get('[data-testid="notification-bell"]').trigger('click');
      await flushPromises();
      await wrapper.get('[data-testid="notification-7"] .item-main').trigger('click');
      await flushPromises();
      expect(requests.find((r) => r.method === 'POST')?.body).toEqual({ ids: ['7'] });
      expect(router.currentRoute.value.fullPath).toBe('/campaigns/3a4b/ledger');
      expect(wrapper.get('[data-testid="notification-count"]').text()).toBe('1');
    });

    it('should not leave the portal for a link elsewhere, and mark all read', async () => {
      const { wrapper, router } = await mountBell();
      await wrapper.get('[data-testid="notification-bell"]').trigger('click');
      await flushPromises();
      await wrapper.get('[data-testid="notification-8"] .item-main').trigger('click');
      await flushPromises();
      expect(router.currentRoute.value.fullPath).toBe('/');

      await wrapper.get('[data-testid="notification-bell"]').trigger('click');
      await flushPromises();
      await wrapper.get('[data-testid="notifications-mark-all"]').trigger('click');
      await flushPromises();
      expect(requests.filter((r) => r.method === 'POST').at(-1)?.body).toEqual({ all: true });
      expect(wrapper.find('[data-testid="notification-count"]').exists()).toBe(false);
    });
  });
});
