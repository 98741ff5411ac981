import type { PoolUsage } from '@localis/shared';

/** The 2027 spring round's pool on cluster-a: two groups hold grants, 3,000 core-hours are left to grant. */
export const POOL_USAGE: PoolUsage = {
  roundId: '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d',
  machine: 'cluster-a',
  pool: 10_000,
  granted: 7_000,
  used: 3_100,
  remaining: 3_900,
  unallocated: 3_000,
  groups: [
    { groupId: '66666666-6666-4666-8666-666666666666', groupName: 'Wave transport', granted: 4_000, used: 2_900, remaining: 1_100 },
    { groupId: '77777777-7777-4777-8777-777777777777', groupName: 'Topological phases', granted: 3_000, used: 200, remaining: 2_800 },
  ],
};
