import type { Assignment, CampaignReviews } from '@localis/shared';
import { createPinia, setActivePinia } from 'pinia';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse as json } from '../test/fetch-stub';
import { assignmentFixture, campaignReviewsFixture } from '../views/campaigns/test/review-fixture';
import { useReviewsStore } from './reviews.store';

const A = assignmentFixture();
const B = assignmentFixture({ id: '8d7c6b5a-4938-4276-8a5f-4e3d2c1b0a9f', reviewerName: 'Tomas Vell' });
const CAMPAIGN_ID = A.campaignId;
const ROUND_ID = '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d';

function reviews(assignments: Assignment[]): CampaignReviews {
  return campaignReviewsFixture({ assignments, can: { assign: true, review: false, declareConflict: false, decide: true } });
}

describe('useReviewsStore', () => {
  let fetchMock: ReturnType<typeof vi.fn>;

  beforeEach(() => setActivePinia(createPinia()));
  afterEach(() => vi.unstubAllGlobals());

  function serve(answers: Record<string, () => Response>): void {
    fetchMock = vi.fn((url: string, init?: RequestInit) => {
      const key = `${init?.method ?? 'GET'} ${url}`;
      return Promise.resolve(answers[key]?.() ?? json(404, { error: { code: 'not_found', message: key } }));
    });
    vi.stubGlobal('fetch', fetchMock);
  }

  describe('loadQueue', () => {
    it('should ask for the scope and round and keep the items', async () => {
      serve({ [`GET /api/v1/committee/queue?scope=all&roundId=${ROUND_ID}`]: () => json(200, { items: [{ campaignId: CAMPAIGN_ID }] }) });
      const store = useReviewsStore();

      await store.loadQueue({ scope: 'all', roundId: ROUND_ID });

      expect(store.queue).toEqual([{ campaignId: CAMPAIGN_ID }]);
      expect(store.queueLoading).toBe(false);
    });
  });

  describe('writes', () => {
    it('should put the saved review in place and read the summary again when a review is submitted', async () => {
      const reviewed = { ...A, state: 'reviewed' as const };
      let reads = 0;
      serve({
        [`GET /api/v1/campaigns/${CAMPAIGN_ID}/reviews`]: () => (reads++ === 0 ? json(200, reviews([A, B])) : json(200, { ...reviews([reviewed, B]), summary: { reviews: 1, meanScores: { merit: 4, feasibility: 4, costJustification: 4 }, meanRecommendedCoreHours: 10 } })),
        [`PUT /api/v1/campaigns/${CAMPAIGN_ID}/assignments/${A.id}/review`]: () => json(200, reviewed),
      });
      const store = useReviewsStore();
      await store.loadForCampaign(CAMPAIGN_ID);

      const saved = await store.submitReview(CAMPAIGN_ID, A.id, { scores: { merit: 4, feasibility: 4, costJustification: 4 }, toProposers: 'A clear plan.', confidential: '', recommendedCoreHours: 10 });

      expect(saved.state).toBe('reviewed');
      expect(store.current?.assignments.map((a) => a.state)).toEqual(['reviewed', 'assigned']);
      expect(store.current?.summary?.reviews).toBe(1);
    });

    it('should keep the write when reading the reviews again fails afterwards', async () => {
      let reads = 0;
      serve({
        [`GET /api/v1/campaigns/${CAMPAIGN_ID}/reviews`]: () => (reads++ === 0 ? json(200, reviews([A, B])) : json(503, { error: { code: 'unavailable', message: 'down' } })),
        [`DELETE /api/v1/campaigns/${CAMPAIGN_ID}/assignments/${B.id}`]: () => new Response(null, { status: 204 }),
      });
      const store = useReviewsStore();
      await store.loadForCampaign(CAMPAIGN_ID);

      await store.unassign(CAMPAIGN_ID, B.id);

      expect(store.current?.assignments.map((a) => a.id)).toEqual([A.id]);
    });

    it('should add a new assignment to the list when a reviewer is assigned', async () => {
      let reads = 0;
      serve({
        [`GET /api/v1/campaigns/${CAMPAIGN_ID}/reviews`]: () => (reads++ === 0 ? json(200, reviews([A])) : json(503, { error: { code: 'unavailable', message: 'down' } })),
        [`POST /api/v1/campaigns/${CAMPAIGN_ID}/assignments`]: () => json(201, B),
      });
      const store = useReviewsStore();
      await store.loadForCampaign(CAMPAIGN_ID);

      await store.assign(CAMPAIGN_ID, B.reviewerPersonId);

      const post = fetchMock.mock.calls.find(([, init]) => init?.method === 'POST')!;
      expect(JSON.parse(String(post[1].body))).toEqual({ reviewerPersonId: B.reviewerPersonId });
      expect(store.current?.assignments.map((a) => a.id)).toEqual([A.id, B.id]);
    });

    it('should forget the reviews and the pool of the campaign when it is decided', async () => {
      serve({
        [`GET /api/v1/campaigns/${CAMPAIGN_ID}/reviews`]: () => json(200, reviews([A])),
        [`GET /api/v1/campaigns/${CAMPAIGN_ID}/pool`]: () => json(200, { roundId: ROUND_ID, machine: 'cluster-a', pool: 10, granted: 0, used: 0, remaining: 0, unallocated: 10, groups: [] }),
        [`POST /api/v1/campaigns/${CAMPAIGN_ID}/decision`]: () => json(200, { id: CAMPAIGN_ID, state: 'declined' }),
      });
      const store = useReviewsStore();
      await store.loadForCampaign(CAMPAIGN_ID);
      await store.loadPool(CAMPAIGN_ID);
      expect(store.poolCampaignId).toBe(CAMPAIGN_ID);

      await store.decide(CAMPAIGN_ID, { outcome: 'decline', message: 'Declined: the grid misses W_c.' });

      expect(store.current).toBeNull();
      expect(store.pool).toBeNull();
      expect(store.poolCampaignId).toBeNull();
    });
  });
});
