import type { Round, RoundInput, RoundPatch } from '@localis/shared';
import { MAX_PAGE_SIZE } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { roundsApi } from '../api/rounds.api';
import { usePagedList } from './paged-list';

export const useRoundsStore = defineStore('rounds', () => {
  /** One page of the admin table. */
  const { items, total, loading, load } = usePagedList(roundsApi.list);
  /** Rounds taking proposals now, soonest closing first, for the campaign form. */
  const open = ref<Round[]>([]);
  const openLoaded = ref(false);

  async function loadOpen(force = false): Promise<Round[]> {
    if (openLoaded.value && !force) return open.value;
    const page = await roundsApi.list({ status: 'open', limit: MAX_PAGE_SIZE, sort: 'closesAt' });
    open.value = page.items;
    openLoaded.value = true;
    return open.value;
  }

  function remember(round: Round): Round {
    const known = items.value.some((r) => r.id === round.id);
    items.value = known ? items.value.map((r) => (r.id === round.id ? round : r)) : [round, ...items.value];
    if (!known) total.value += 1;
    const others = open.value.filter((r) => r.id !== round.id);
    open.value = round.status === 'open' ? [...others, round].sort((a, b) => a.closesAt.localeCompare(b.closesAt)) : others;
    return round;
  }

  /** One round, also one that is no longer open (a draft may sit in a closed round). */
  const get = (id: string) => roundsApi.get(id);
  const create = async (input: RoundInput) => remember(await roundsApi.create(input));
  const update = async (id: string, patch: RoundPatch) => remember(await roundsApi.update(id, patch));

  return { items, total, loading, open, openLoaded, load, loadOpen, get, create, update };
});
