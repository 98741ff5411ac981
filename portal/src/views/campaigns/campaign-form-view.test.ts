import { CampaignSpec, estimateCampaign, type Campaign } from '@localis/shared';
import { flushPromises } from '@vue/test-utils';
import Select from 'primevue/select';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { jsonResponse as json, notServed, stubFetch } from '../../test/fetch-stub';
import { mountPage, resetTestPage } from '../../test/mount-in-app';
import { ESTIMATE_DELAY_MS } from './composables/use-live-estimate';
import CampaignFormView from './campaign-form-view.vue';
import { testRouter } from './test/campaign-fixture';

const GROUP = { id: '5d0c2b3e-8f4a-4c1d-9e2b-7a6f5e4d3c21', name: 'Disorder and Topology', institutionName: 'Kestrel University' };
const ROUND = {
  id: '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d',
  name: '2027 spring round',
  opensAt: '2027-01-01T00:00:00.000Z',
  closesAt: '2027-03-31T23:59:59.000Z',
  status: 'open',
  pools: [{ machine: 'cluster-a', coreHours: 5_000_000 }],
};
const SAVED_ID = '0f1e2d3c-4b5a-4968-8776-655443322110';

const DRAFT_SPEC = CampaignSpec.parse({
  model: 'anderson-box',
  dimension: 3,
  symmetryClass: 'AI',
  sizes: [8, 12, 16],
  disorder: { values: [15, 16, 16.5, 17, 18] },
  energies: [0],
  realizations: 1,
  method: 'transfer-matrix',
  targetPrecision: 0.01,
  node: { coresPerNode: 64, memoryGiBPerNode: 256 },
});

function draft(overrides: Partial<Campaign> = {}): Campaign {
  return {
    id: SAVED_ID,
    title: 'Critical disorder of the 3D Anderson model',
    abstract: 'Locate W_c at E = 0 by finite-size scaling of the Lyapunov exponent.',
    justification: '## Why\nBecause.',
    grantedCoreHours: null,
    state: 'draft',
    groupId: GROUP.id,
    groupName: GROUP.name,
    institutionName: GROUP.institutionName,
    roundId: ROUND.id,
    roundName: ROUND.name,
    ownerPersonId: GROUP.id,
    ownerName: 'Ada Varga',
    machine: 'cluster-a',
    method: 'transfer-matrix',
    dimension: 3,
    symmetryClass: 'AI',
    requestedCoreHours: 10,
    peakMemoryBytes: 1,
    warningCount: 0,
    createdAt: '2027-01-05T10:00:00.000Z',
    updatedAt: '2027-01-05T10:00:00.000Z',
    submittedAt: null,
    spec: DRAFT_SPEC,
    estimate: estimateCampaign(DRAFT_SPEC),
    notices: [],
    history: [],
    can: { edit: true, submit: true, withdraw: true, startReview: false, decide: false, recordRuns: false, transfer: false, uploadResults: false, attachFiles: false, withdrawArchives: false },
    ...overrides,
  };
}

const page = (items: unknown[]) => ({ items, total: items.length, limit: 200, offset: 0 });

let fetchMock: ReturnType<typeof stubFetch>;
/** What POST /campaigns answers in a test, given what was sent. */
let createAnswer: (body: Record<string, unknown>) => Response;
/** What GET /campaigns/:id answers, and PATCH echoes onto. */
let stored: Campaign;

function serve(url: string, init?: RequestInit): Response {
  if (url.startsWith('/api/v1/groups')) return json(200, page([GROUP]));
  if (url.startsWith('/api/v1/rounds')) return json(200, page([ROUND]));
  if (url === '/api/v1/campaigns' && init?.method === 'POST') return createAnswer(JSON.parse(String(init.body)));
  if (url === `/api/v1/campaigns/${SAVED_ID}` && init?.method === 'PATCH') return json(200, { ...stored, ...JSON.parse(String(init.body)) });
  if (url === `/api/v1/campaigns/${SAVED_ID}`) return json(200, stored);
  return notServed(url);
}

async function mountForm(path = '/campaigns/new') {
  const router = testRouter(
    { path: '/campaigns/new', name: 'campaign-new', component: CampaignFormView },
    { path: '/campaigns/:id/edit', name: 'campaign-edit', component: CampaignFormView, props: true },
  );
  const host = await mountPage(router, path);
  return { wrapper: host.getComponent(CampaignFormView), router };
}

const pause = () => new Promise((resolve) => setTimeout(resolve, ESTIMATE_DELAY_MS + 50));
const field = (wrapper: Awaited<ReturnType<typeof mountForm>>['wrapper'], id: string) => wrapper.get(`[data-testid="${id}"]`);

// Each test mounts the whole form (PrimeVue, router, stores): slower than a unit test, and slower still on a busy machine.
describe('CampaignFormView', { timeout: 20_000 }, () => {
  beforeEach(() => {
    fetchMock = stubFetch(serve);
    createAnswer = () => json(500, {});
    stored = draft();
  });

  afterEach(resetTestPage);

  describe('the live estimate', () => {
    it('should show the estimate and raise the critical-disorder notice as the grid moves away from W_c and back', async () => {
      const { wrapper } = await mountForm();

      expect(field(wrapper, 'live-total').text()).toMatch(/core-hours$/);
      expect(field(wrapper, 'estimate-total').text()).toMatch(/core-hours$/);
      expect(wrapper.find('[data-testid="notice-grid-misses-critical-disorder"]').exists()).toBe(false);

      await field(wrapper, 'disorder-from').setValue('12');
      await field(wrapper, 'disorder-to').setValue('14');
      await pause();
      expect(wrapper.find('[data-testid="notice-grid-misses-critical-disorder"]').exists()).toBe(true);

      await field(wrapper, 'disorder-from').setValue('15');
      await field(wrapper, 'disorder-to').setValue('18');
      await pause();
      expect(wrapper.find('[data-testid="notice-grid-misses-critical-disorder"]').exists()).toBe(false);
    });

    it('should put a nested error beside its field while the plan is typed', async () => {
      const { wrapper } = await mountForm();

      await field(wrapper, 'disorder-step').setValue('0');
      await pause();

      expect(wrapper.get('#disorder-step-error').text()).toBe('Step must be greater than 0');
      expect(field(wrapper, 'disorder-step').attributes('aria-describedby')).toContain('disorder-step-error');
      expect(wrapper.find('[data-testid="live-stale"]').exists()).toBe(true);
    });
  });

  describe('choosing', () => {
    it('should show the options of the method chosen in its select', async () => {
      const { wrapper } = await mountForm();
      expect(wrapper.find('[data-testid="options-transfer-matrix"]').exists()).toBe(true);

      const method = wrapper.findAllComponents(Select).find((s) => s.attributes('data-testid') === 'spec-method')!;
      expect(method.props('modelValue')).toBe('transfer-matrix');
      method.vm.$emit('update:modelValue', 'kernel-polynomial');
      await flushPromises();

      expect(wrapper.find('[data-testid="options-transfer-matrix"]').exists()).toBe(false);
      expect(wrapper.find('[data-testid="options-kernel-polynomial"]').exists()).toBe(true);
      expect(wrapper.get('label[for="spec-method"]').text()).toBe('Method');
    });
  });

  describe('saving', () => {
    it('should list what needs attention and send nothing when required fields are empty', async () => {
      const { wrapper } = await mountForm();

      await wrapper.get('form#campaign-form').trigger('submit');
      await flushPromises();

      expect(wrapper.get('#campaign-title-error').text()).toBe('Title needs at least 3 characters');
      expect(field(wrapper, 'form-errors').text()).toContain('Abstract');
      expect(fetchMock.mock.calls.some(([, init]) => init?.method === 'POST')).toBe(false);
    });

    it('should put the server details beside nested fields when the server answers 422', async () => {
      createAnswer = () =>
        json(422, {
          error: { code: 'invalid', message: 'Some fields are not valid.', details: [{ path: ['spec', 'disorder', 'step'], message: 'take a larger step' }] },
        });
      const { wrapper } = await mountForm();
      await field(wrapper, 'campaign-title').setValue('Critical disorder of the 3D Anderson model');
      await field(wrapper, 'campaign-abstract').setValue('Locate W_c at E = 0 by finite-size scaling of the Lyapunov exponent.');

      await wrapper.get('form#campaign-form').trigger('submit');
      await flushPromises();

      expect(wrapper.get('#disorder-step-error').text()).toBe('Take a larger step');
    });

    it('should create the draft with the group, round and machine chosen and go to its page when it is valid', async () => {
      createAnswer = (body) => json(201, { ...body, id: SAVED_ID, state: 'draft', requestedCoreHours: 1234 });
      const { wrapper, router } = await mountForm();
      await field(wrapper, 'campaign-title').setValue('Critical disorder of the 3D Anderson model');
      await field(wrapper, 'campaign-abstract').setValue('Locate W_c at E = 0 by finite-size scaling of the Lyapunov exponent.');
      await field(wrapper, 'spec-sizes').setValue('6, 8, 12, 16, 24');

      await wrapper.get('form#campaign-form').trigger('submit');
      await flushPromises();

      const post = fetchMock.mock.calls.find(([, init]) => init?.method === 'POST')!;
      const body = JSON.parse(post[1]?.body as string);
      expect(body).toMatchObject({ groupId: GROUP.id, roundId: ROUND.id, machine: 'cluster-a' });
      expect(body.spec).toMatchObject({ sizes: [6, 8, 12, 16, 24], disorder: { from: 15, to: 18, step: 0.25 }, energies: [0], targetPrecision: 0.005 });
      expect(router.currentRoute.value.name).toBe('campaign-detail');
      expect(router.currentRoute.value.params.id).toBe(SAVED_ID);
    });
  });

  describe('editing a draft', () => {
    it('should fill the form from the draft and patch everything but the group when it is saved', async () => {
      const { wrapper, router } = await mountForm(`/campaigns/${SAVED_ID}/edit`);

      expect((field(wrapper, 'campaign-title').element as HTMLInputElement).value).toBe(stored.title);
      expect(field(wrapper, 'campaign-group').text()).toBe(GROUP.name);
      expect((field(wrapper, 'disorder-values').element as HTMLInputElement).value).toBe('15, 16, 16.5, 17, 18');
      expect((field(wrapper, 'spec-sizes').element as HTMLInputElement).value).toBe('8, 12, 16');

      await field(wrapper, 'spec-sizes').setValue('8, 12, 16, 24');
      await wrapper.get('form#campaign-form').trigger('submit');
      await flushPromises();

      const patch = fetchMock.mock.calls.find(([, init]) => init?.method === 'PATCH')!;
      const body = JSON.parse(patch[1]?.body as string);
      expect(body).not.toHaveProperty('groupId');
      expect(body.spec).toMatchObject({ sizes: [8, 12, 16, 24], disorder: { values: [15, 16, 16.5, 17, 18] } });
      expect(router.currentRoute.value.name).toBe('campaign-detail');
    });

    it('should say the campaign cannot be changed when it is no longer a draft', async () => {
      stored = draft({ state: 'submitted', can: { edit: false, submit: false, withdraw: true, startReview: false, decide: false, recordRuns: false, transfer: false, uploadResults: false, attachFiles: false, withdrawArchives: false } });
      const { wrapper } = await mountForm(`/campaigns/${SAVED_ID}/edit`);

      expect(field(wrapper, 'campaign-not-editable').text()).toContain('is submitted: only drafts can be changed');
      expect(wrapper.find('[data-testid="save-campaign"]').exists()).toBe(false);
    });
  });
});
