import type { CommitteeQueueItem, Role } from '@localis/shared';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import ConfirmationService from 'primevue/confirmationservice';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import { createMemoryHistory, createRouter, RouterView } from 'vue-router';
import { useSessionStore } from '../../stores/session.store';
import CommitteeQueueView from './committee-queue-view.vue';

const ITEM: CommitteeQueueItem = {
  campaignId: '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d',
  title: 'Critical disorder of the 3D Anderson model',
  state: 'in-review',
  groupName: 'Brennmoor disorder group',
  institutionName: 'Brennmoor Institute of Lattice Physics',
  roundId: '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d',
  roundName: '2027 spring round',
  machine: 'cluster-a',
  requestedCoreHours: 1_250_000,
  submittedAt: '2027-01-10T09:00:00.000Z',
  assigned: 3,
  reviewed: 2,
  conflicts: 1,
  myAssignmentId: '7c6b5a49-3827-4165-9f4e-3d2c1b0a9f8e',
  myState: 'assigned',
  meanScore: 3.6667,
};

const json = (body: unknown) => new Response(JSON.stringify(body), { status: 200, headers: { 'content-type': 'application/json' } });
let queue: CommitteeQueueItem[] = [];
let fetchMock: ReturnType<typeof vi.fn>;

async function mountQueue(roles: Role[]) {
  fetchMock = vi.fn((url: string) =>
    Promise.resolve(url.startsWith('/api/v1/rounds') ? json({ items: [], total: 0, limit: 200, offset: 0 }) : json({ items: queue })),
  );
  vi.stubGlobal('fetch', fetchMock);
  const page = { template: '<div />' };
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/committee', name: 'committee', component: CommitteeQueueView },
      { path: '/campaigns/:id', name: 'campaign-detail', component: page },
    ],
  });
  await router.push('/committee');
  await router.isReady();
  const pinia = createPinia();
  setActivePinia(pinia);
  useSessionStore().person = { id: '1f2e3d4c-5b6a-4798-8a7b-6c5d4e3f2a1b', name: 'Odile Brandt', email: 'odile@kestrel.example', institutionId: null, roles };
  const host = mount(defineComponent({ render: () => h(RouterView) }), {
    global: { plugins: [pinia, router, [PrimeVue, { theme: 'none' }], ToastService, ConfirmationService], stubs: { teleport: true } },
    attachTo: document.body,
  });
  await flushPromises();
  return { wrapper: host, router };
}

const queueAsks = () => fetchMock.mock.calls.map(([url]) => String(url)).filter((url) => url.startsWith('/api/v1/committee/queue'));

describe('CommitteeQueueView', { timeout: 20_000 }, () => {
  afterEach(() => {
    vi.unstubAllGlobals();
    document.body.innerHTML = '';
    queue = [];
  });

  describe('a committee member', () => {
    it('should show their own assignments with progress, their part and the mean score', async () => {
      queue = [ITEM];
      const { wrapper } = await mountQueue(['committee']);

      expect(queueAsks()).toEqual(['/api/v1/committee/queue?scope=mine']);
      const row = wrapper.get('[data-testid="committee-queue"] tbody tr');
      expect(row.get('a').attributes('href')).toBe(`/campaigns/${ITEM.campaignId}`);
      expect(row.get('[data-testid="review-progress"]').text()).toBe('2 of 3 reviewed · 1 conflict');
      expect(row.get('[data-testid="my-state-assigned"]').text()).toBe('To review');
      expect(row.text()).toContain('3.7');
      expect(row.text()).toContain('1.25 M core-hours');
    });

    it('should say what to do when nothing is assigned to them', async () => {
      const { wrapper } = await mountQueue(['committee']);

      expect(wrapper.text()).toContain('Nothing is assigned to you');
      expect(wrapper.text()).toContain('All in review');
    });

    it('should ask for the whole queue and keep it in the address when All in review is chosen', async () => {
      const { wrapper, router } = await mountQueue(['committee']);

      const all = wrapper.get('[data-testid="queue-scope"]').findAll('button').find((b) => b.text() === 'All in review')!;
      await all.trigger('click');
      await flushPromises();

      expect(router.currentRoute.value.query).toEqual({ scope: 'all' });
      expect(queueAsks()).toEqual(['/api/v1/committee/queue?scope=mine', '/api/v1/committee/queue?scope=all']);
    });
  });

  describe('the office', () => {
    it('should ask for the whole queue and offer no scope when the person is not on the committee', async () => {
      const { wrapper } = await mountQueue(['admin']);

      expect(queueAsks()).toEqual(['/api/v1/committee/queue?scope=all']);
      expect(wrapper.find('[data-testid="queue-scope"]').exists()).toBe(false);
      expect(wrapper.text()).toContain('No proposal is waiting for the committee');
    });
  });
});
