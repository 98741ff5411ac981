import type { CommitteeQueueItem } from '@localis/shared';

/** A proposal in the committee queue: three reviewers assigned, one review in, none by the reader. */
export function queueItemFixture(overrides: Partial<CommitteeQueueItem> = {}): CommitteeQueueItem {
  return {
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
    reviewed: 1,
    conflicts: 0,
    myAssignmentId: null,
    myState: null,
    meanScore: null,
    ...overrides,
  };
}
