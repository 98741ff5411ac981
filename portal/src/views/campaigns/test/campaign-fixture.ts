import type { Campaign } from '@localis/shared';
import type { Router } from 'vue-router';
import { memoryRouter, type TestRoute } from '../../../test/mount-in-app';

/** What a campaign allows a reader who may do nothing with it; tests spread it and allow one thing. */
export const CAN_NOTHING: Campaign['can'] = {
  edit: false,
  submit: false,
  withdraw: false,
  startReview: false,
  decide: false,
  recordRuns: false,
  transfer: false,
  uploadResults: false,
  attachFiles: false,
  withdrawArchives: false,
};

/** A campaign as GET /campaigns/:id answers, for component tests. */
export function campaignFixture(overrides: Partial<Campaign> = {}): Campaign {
  return {
    id: '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d',
    title: 'Critical disorder of the 3D Anderson model',
    state: 'draft',
    groupId: '1b2c3d4e-5f60-4718-8a9b-0c1d2e3f4a5b',
    groupName: 'Brennmoor disorder group',
    institutionName: 'Brennmoor Institute of Lattice Physics',
    roundId: '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d',
    roundName: '2027 spring round',
    ownerPersonId: '0a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d',
    ownerName: 'Ilse Marrow',
    machine: 'cluster-a',
    method: 'transfer-matrix',
    dimension: 3,
    symmetryClass: 'AI',
    requestedCoreHours: 1_250_000,
    peakMemoryBytes: 3 * 1024 ** 3,
    warningCount: 1,
    createdAt: '2026-11-02T09:00:00.000Z',
    updatedAt: '2026-11-03T10:30:00.000Z',
    submittedAt: null,
    abstract: 'We locate the critical disorder W_c of the three-dimensional Anderson model with box disorder.',
    justification: '## Aim\n\nA precise **nu**.',
    spec: {
      model: 'anderson-box',
      dimension: 3,
      symmetryClass: 'AI',
      goal: 'critical-point',
      sizes: [8, 12, 16],
      disorder: { from: 15, to: 18, step: 0.25 },
      energies: [0],
      realizations: 100,
      method: 'transfer-matrix',
      targetPrecision: 0.01,
      methodOptions: {},
      node: { coresPerNode: 48, memoryGiBPerNode: 192 },
    },
    estimate: {
      method: 'transfer-matrix',
      totalCoreHours: 1_250_000,
      rows: [],
      peakMemoryBytes: 3 * 1024 ** 3,
      nodeMemoryBytes: 192 * 1024 ** 3,
      fitsNode: true,
      arithmetic: { kind: 'real', bytesPerEntry: 8 },
      sizeExponent: 7,
      rate: { source: 'default', flopsPerCore: 1e9 },
      assumptions: [],
    },
    notices: [],
    history: [{ fromState: null, toState: 'draft', actorPersonId: null, actorName: 'Ilse Marrow', note: null, at: '2026-11-02T09:00:00.000Z' }],
    grantedCoreHours: null,
    can: CAN_NOTHING,
    ...overrides,
  };
}

/** The campaign pages, blank: a router that knows them by name renders links to them. */
const CAMPAIGN_PAGES: TestRoute[] = [
  { path: '/', name: 'home' },
  { path: '/campaigns', name: 'campaigns' },
  { path: '/campaigns/:id', name: 'campaign-detail' },
  { path: '/campaigns/:id/edit', name: 'campaign-edit' },
  { path: '/campaigns/:id/print', name: 'campaign-print' },
  { path: '/campaigns/:id/decision', name: 'campaign-decision' },
  { path: '/campaigns/:id/ledger', name: 'campaign-ledger' },
  { path: '/campaigns/:id/runs', name: 'campaign-runs' },
  { path: '/campaigns/:id/runs/import', name: 'campaign-runs-import' },
];

/** A router that knows the campaign pages by name; `pages` are the real ones a test mounts, in place of the blank ones of the same name. */
export function testRouter(...pages: TestRoute[]): Router {
  const mounted = new Set(pages.map((p) => p.name));
  return memoryRouter([...CAMPAIGN_PAGES.filter((p) => !mounted.has(p.name)), ...pages]);
}
