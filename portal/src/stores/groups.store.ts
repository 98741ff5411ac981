import type { ResearchGroup } from '@localis/shared';
import { MAX_PAGE_SIZE } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { groupsApi } from '../api/groups.api';

export const useGroupsStore = defineStore('groups', () => {
  /** The research groups the signed-in person belongs to or leads, by name. */
  const mine = ref<ResearchGroup[]>([]);
  const mineLoaded = ref(false);

  async function loadMine(force = false): Promise<ResearchGroup[]> {
    if (mineLoaded.value && !force) return mine.value;
    const page = await groupsApi.list({ mine: 'true', limit: MAX_PAGE_SIZE, sort: 'name' });
    mine.value = page.items;
    mineLoaded.value = true;
    return mine.value;
  }

  return { mine, mineLoaded, loadMine };
});
