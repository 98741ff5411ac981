import { createPinia, setActivePinia } from 'pinia';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { useWorklistsStore } from './worklists.store';

function page(items: unknown[], total: number) {
  return new Response(JSON.stringify({ items, total, limit: 5, offset: 0 }), { status: 200, headers: { 'content-type': 'application/json' } });
}

function askedFor(fetchMock: ReturnType<typeof vi.fn>): URLSearchParams {
  const url = String(fetchMock.mock.calls[0][0]);
  return new URL(url, 'http://localis.test').searchParams;
}

describe('useWorklistsStore', () => {
  beforeEach(() => setActivePinia(createPinia()));
  afterEach(() => vi.unstubAllGlobals());

  describe('loadCampaigns', () => {
    it('should ask for your own drafts, last changed first, when loading drafts to finish', async () => {
      const fetchMock = vi.fn().mockResolvedValue(page([{ id: 'c1', title: 'Critical W' }], 7));
      vi.stubGlobal('fetch', fetchMock);
      const store = useWorklistsStore();

      await store.loadCampaigns('drafts');

      const q = askedFor(fetchMock);
      expect(Object.fromEntries(q)).toEqual({ scope: 'mine', state: 'draft', sort: '-updatedAt', limit: '5' });
      expect(store.campaigns.drafts).toEqual({ count: 7, first: [{ id: 'c1', title: 'Critical W' }] });
    });

    it('should ask for the drafts of your groups when a PI loads ready to submit', async () => {
      const fetchMock = vi.fn().mockResolvedValue(page([], 0));
      vi.stubGlobal('fetch', fetchMock);

      await useWorklistsStore().loadCampaigns('readyToSubmit');

      expect(askedFor(fetchMock).get('scope')).toBe('my-groups');
      expect(askedFor(fetchMock).get('state')).toBe('draft');
    });

    it('should ask for submitted proposals, longest waiting first, when loading the review queue', async () => {
      const fetchMock = vi.fn().mockResolvedValue(page([], 0));
      vi.stubGlobal('fetch', fetchMock);

      await useWorklistsStore().loadCampaigns('awaitingReview');

      const q = askedFor(fetchMock);
      expect(q.get('state')).toBe('submitted');
      expect(q.get('sort')).toBe('submittedAt');
      expect(q.has('scope')).toBe(false);
    });
  });

  describe('loadOpenRounds', () => {
    it('should ask for open rounds, closing soonest first, and keep the count', async () => {
      const fetchMock = vi.fn().mockResolvedValue(page([{ id: 'r1' }], 1));
      vi.stubGlobal('fetch', fetchMock);
      const store = useWorklistsStore();

      await store.loadOpenRounds();

      expect(String(fetchMock.mock.calls[0][0])).toMatch(/^\/api\/v1\/rounds\?/);
      expect(askedFor(fetchMock).get('status')).toBe('open');
      expect(askedFor(fetchMock).get('sort')).toBe('closesAt');
      expect(store.openRounds?.count).toBe(1);
    });
  });
});
