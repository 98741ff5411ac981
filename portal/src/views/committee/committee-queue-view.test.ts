import type { CommitteeQueueItem, Role } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import { afterEach, describe, expect, it } from 'vitest';
import { useSessionStore } from '../../stores/session.store';
import { jsonResponse, stubFetch } from '../../test/fetch-stub';
import { memoryRouter, mountPage, resetTestPage } from '../../test/mount-in-app';
import CommitteeQueueView from './committee-queue-view.vue';
import { queueItemFixture } from './test/queue-item-fixture';

const ITEM = queueItemFixture({ reviewed: 2, conflicts: 1, myAssignmentId: '7c6b5a49-3827-4165-9f4e-3d2c1b0a9f8e', myState: 'assigned', meanScore: 3.6667 });

let queue: CommitteeQueueItem[] = [];
let fetchMock: ReturnType<typeof stubFetch>;

async function mountQueue(roles: Role[]) {
  fetchMock = stubFetch((url) => jsonResponse(200, url.startsWith('/api/v1/rounds') ? { items: [], total: 0, limit: 200, offset: 0 } : { items: queue }));
  const router = memoryRouter([
    { path: '/committee', name: 'committee', component: CommitteeQueueView },
    { path: '/campaigns/:id', name: 'campaign-detail' },
  ]);
  const wrapper = await mountPage(router, '/committee', () => {
    useSessionStore().person = { id: '1f2e3d4c-5b6a-4798-8a7b-6c5d4e3f2a1b', name: 'Odile Brandt', email: 'odile@kestrel.example', institutionId: null, roles };
  });
  return { wrapper, router };
}

const queueAsks = () => fetchMock.mock.calls.map(([url]) => String(url)).filter((url) => url.startsWith('/api/v1/committee/queue'));

describe('CommitteeQueueView', { timeout: 20_000 }, () => {
  afterEach(() => {
    resetTestPage();
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

    it('should leave out the "Your part" column when the person is not on the committee', async () => {
      queue = [{ ...ITEM, myAssignmentId: null, myState: null }];
      const { wrapper } = await mountQueue(['admin']);

      const headers = wrapper.findAll('[data-testid="committee-queue"] thead th').map((th) => th.text());
      expect(headers).toContain('Reviews');
      expect(headers).not.toContain('Your part');
    });
  });

  describe('columns', () => {
    it('should leave out the Round column when one round is chosen', async () => {
      queue = [ITEM];
      const { wrapper, router } = await mountQueue(['committee']);
      expect(wrapper.findAll('[data-testid="committee-queue"] thead th').map((th) => th.text())).toContain('Round');

      await router.push({ path: '/committee', query: { roundId: ITEM.roundId } });
      await flushPromises();

      expect(wrapper.findAll('[data-testid="committee-queue"] thead th').map((th) => th.text())).not.toContain('Round');
    });
  });
});
