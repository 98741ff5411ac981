import type { ApiToken, ApiTokenInput, CreatedApiToken } from '@localis/shared';
import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import { tokensApi } from '../api/tokens.api';
import { tokenState } from '../lib/token-state';

/** Tokens closer than this to their expiry are shown on the home page. */
export const EXPIRY_WARNING_DAYS = 14;

export const useTokensStore = defineStore('tokens', () => {
  const tokens = ref<ApiToken[]>([]);
  const loaded = ref(false);
  const loading = ref(false);

  /** Active tokens that stop working within two weeks, soonest first. */
  const expiringSoon = computed(() => {
    const limit = Date.now() + EXPIRY_WARNING_DAYS * 24 * 60 * 60 * 1000;
    return tokens.value
      .filter((t) => tokenState(t) === 'active' && new Date(t.expiresAt).getTime() <= limit)
      .sort((a, b) => a.expiresAt.localeCompare(b.expiresAt));
  });

  async function load(): Promise<void> {
    loading.value = true;
    try {
      tokens.value = (await tokensApi.list()).items;
      loaded.value = true;
    } finally {
      loading.value = false;
    }
  }

  /**
   * Creates a token and returns the answer with its secret. The secret is handed to the caller
   * and never kept in the store: it is shown once and then forgotten.
   */
  async function create(input: ApiTokenInput): Promise<CreatedApiToken> {
    const created = await tokensApi.create(input);
    tokens.value = [created.token, ...tokens.value];
    return created;
  }

  async function revoke(id: string): Promise<void> {
    await tokensApi.revoke(id);
    await load();
  }

  return { tokens, loaded, loading, expiringSoon, load, create, revoke };
});
