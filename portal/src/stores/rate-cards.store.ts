import type { RateCard, RateCardInput } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { rateCardsApi } from '../api/rate-cards.api';
import { isAbort, latestOnly } from './latest-only';

export const useRateCardsStore = defineStore('rateCards', () => {
  /** Whose cards `items` holds. */
  const institutionId = ref<string | null>(null);
  /** Newest first, as the api answers. */
  const items = ref<RateCard[]>([]);
  const loading = ref(false);
  const reads = latestOnly();

  async function load(id: string): Promise<void> {
    const { signal, isCurrent } = reads.begin();
    if (institutionId.value !== id) {
      institutionId.value = id;
      items.value = [];
    }
    loading.value = true;
    try {
      const answer = await rateCardsApi.list(id, signal);
      if (isCurrent()) items.value = answer.items;
    } catch (error) {
      if (isAbort(error)) return;
      throw error;
    } finally {
      if (isCurrent()) loading.value = false;
    }
  }

  /**
   * Adds a card. The server also closes the card before it (its `effectiveTo`), so the list is
   * read again rather than patched here.
   */
  async function create(id: string, input: RateCardInput): Promise<RateCard> {
    const card = await rateCardsApi.create(id, input);
    try {
      await load(id);
    } catch {
      // The card is saved; until the list can be read again it heads what is shown.
      if (institutionId.value === id) items.value = [card, ...items.value.filter((c) => c.id !== card.id)];
    }
    return card;
  }

  return { institutionId, items, loading, load, create };
});
