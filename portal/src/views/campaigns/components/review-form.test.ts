import type { Assignment, Review } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import InputNumber from 'primevue/inputnumber';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { defineComponent, h } from 'vue';
import { jsonResponse as json, notServed, stubFetch } from '../../../test/fetch-stub';
import { mountPage, resetTestPage } from '../../../test/mount-in-app';
import { testRouter } from '../test/campaign-fixture';
import { assignmentFixture } from '../test/review-fixture';
import ReviewForm from './review-form.vue';

const SAVED: Review = {
  scores: { merit: 4, feasibility: 3, costJustification: 5 },
  toProposers: 'A clear plan; the largest size adds little to the estimate of nu.',
  confidential: '',
  recommendedCoreHours: 900_000,
  submittedAt: '2027-02-01T10:00:00.000Z',
  updatedAt: '2027-02-01T10:00:00.000Z',
};

function assignment(review: Review | null): Assignment {
  return assignmentFixture({ state: review ? 'reviewed' : 'assigned', review });
}

const { id: ASSIGNMENT_ID, campaignId: CAMPAIGN_ID } = assignment(null);

/** What PUT …/review answers in a test, given the body sent. */
let putAnswer: (body: Record<string, unknown>) => Response;
let fetchMock: ReturnType<typeof stubFetch>;

function serve(url: string, init?: RequestInit): Response {
  if (url === `/api/v1/campaigns/${CAMPAIGN_ID}/assignments/${ASSIGNMENT_ID}/review` && init?.method === 'PUT') return putAnswer(JSON.parse(String(init.body)));
  // The store reads the reviews again after a save; failing that read leaves the saved state in place.
  if (url === `/api/v1/campaigns/${CAMPAIGN_ID}/reviews`) return json(503, { error: { code: 'unavailable', message: 'not in this test' } });
  return notServed(url);
}

async function mountForm(review: Review | null = null) {
  const Page = defineComponent({ render: () => h(ReviewForm, { campaignId: CAMPAIGN_ID, assignment: assignment(review), requested: 1_250_000 }) });
  // Inside a route, as on the campaign page: the unsaved-changes guard watches leaving it.
  const host = await mountPage(testRouter({ path: '/campaigns/:id', name: 'campaign-detail', component: Page }), `/campaigns/${CAMPAIGN_ID}`);
  return host.getComponent(ReviewForm);
}

type FormWrapper = Awaited<ReturnType<typeof mountForm>>;
const byTestId = (wrapper: FormWrapper, id: string) => wrapper.get(`[data-testid="${id}"]`);

async function score(wrapper: FormWrapper, criterion: string, value: number): Promise<void> {
  await byTestId(wrapper, `review-score-${criterion}`).findAll('button')[value - 1].trigger('click');
}

async function fillIn(wrapper: FormWrapper): Promise<void> {
  await score(wrapper, 'merit', 5);
  await score(wrapper, 'feasibility', 4);
  await score(wrapper, 'costJustification', 3);
  await byTestId(wrapper, 'review-to-proposers').setValue('The **grid** brackets W_c well; drop L = 24.');
  await byTestId(wrapper, 'review-confidential').setValue('The group used its last grant in full.');
  wrapper.getComponent(InputNumber).vm.$emit('update:modelValue', 1_000_000);
  await flushPromises();
}

const puts = () => fetchMock.mock.calls.filter(([, init]) => init?.method === 'PUT');

describe('ReviewForm', { timeout: 20_000 }, () => {
  beforeEach(() => {
    fetchMock = stubFetch(serve);
    putAnswer = (body) => json(200, { ...assignment({ ...SAVED, ...body } as Review), state: 'reviewed' });
  });

  afterEach(resetTestPage);

  describe('a first review', () => {
    it('should show each criterion with its question and say nothing is submitted yet', async () => {
      const wrapper = await mountForm();

      expect(wrapper.get('#review-score-merit-label').text()).toBe('Scientific merit');
      expect(wrapper.get('#review-score-merit-hint').text()).toContain('open question about localization');
      expect(byTestId(wrapper, 'review-status').text()).toContain('Not submitted yet');
      expect(byTestId(wrapper, 'review-submit').text()).toBe('Submit review');
    });

    it('should put the errors beside the scores and the comments and send nothing when the form is blank', async () => {
      const wrapper = await mountForm();

      await wrapper.get('form').trigger('submit');
      await flushPromises();

      expect(wrapper.get('#review-score-merit-error').text()).toBe('Give a score from 1 to 5');
      expect(wrapper.get('#review-score-cost-justification-error').text()).toBe('Give a score from 1 to 5');
      expect(wrapper.get('#review-to-proposers-error').text()).toBe('Write at least a sentence for the proposers');
      expect(wrapper.get('#review-recommended-error').text()).toBe('Recommend a number of core-hours (0 to decline)');
      expect(puts()).toHaveLength(0);
      // The keyboard moves to the first field to fix: the first score's buttons.
      expect(document.activeElement).toBe(byTestId(wrapper, 'review-score-merit').find('button').element);
    });

    it('should send the review with PUT and show it as saved when it is valid', async () => {
      const wrapper = await mountForm();
      await fillIn(wrapper);

      await wrapper.get('form').trigger('submit');
      await flushPromises();

      expect(puts()).toHaveLength(1);
      expect(JSON.parse(String(puts()[0][1]?.body))).toEqual({
        scores: { merit: 5, feasibility: 4, costJustification: 3 },
        toProposers: 'The **grid** brackets W_c well; drop L = 24.',
        confidential: 'The group used its last grant in full.',
        recommendedCoreHours: 1_000_000,
      });
      expect(wrapper.emitted('saved')).toHaveLength(1);
      expect(byTestId(wrapper, 'review-status').text()).toContain('Saved');
      expect(byTestId(wrapper, 'review-submit').text()).toBe('Save changes');
    });

    it('should put the server details beside the nested field when the server answers 422', async () => {
      putAnswer = () =>
        json(422, { error: { code: 'invalid', message: 'Some fields are not valid.', details: [{ path: ['scores', 'feasibility'], message: 'scores run from 1 (poor) to 5 (excellent)' }] } });
      const wrapper = await mountForm();
      await fillIn(wrapper);

      await wrapper.get('form').trigger('submit');
      await flushPromises();

      expect(wrapper.get('#review-score-feasibility-error').text()).toBe('Scores run from 1 (poor) to 5 (excellent)');
      expect(byTestId(wrapper, 'review-status').text()).toContain('Unsaved changes');
    });
  });

  describe('editing a saved review', () => {
    it('should fill the form from the review and allow saving only once something changed', async () => {
      const wrapper = await mountForm(SAVED);

      expect((byTestId(wrapper, 'review-to-proposers').element as HTMLTextAreaElement).value).toBe(SAVED.toProposers);
      expect(byTestId(wrapper, 'review-score-merit').findAll('button')[3].attributes('aria-pressed')).toBe('true');
      expect(byTestId(wrapper, 'review-submit').attributes('disabled')).toBeDefined();

      await score(wrapper, 'feasibility', 2);

      expect(byTestId(wrapper, 'review-status').text()).toContain('Unsaved changes');
      expect(byTestId(wrapper, 'review-submit').attributes('disabled')).toBeUndefined();
    });
  });
});
