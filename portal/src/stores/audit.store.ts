import type { AuditEntry } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { auditApi, type AuditQuery } from '../api/audit.api';
import { isAbort, latestOnly } from './latest-only';

export const useAuditStore = defineStore('audit', () => {
  const items = ref<AuditEntry[]>([]);
  const total = ref(0);
  const loading = ref(false);
  const recent = ref<AuditEntry[] | null>(null);

  const lists = latestOnly();

  async function load(query: AuditQuery): Promise<void> {
    const { signal, isCurrent } = lists.begin();
    loading.value = true;
    try {
      const page = await auditApi.list(query, signal);
      if (!isCurrent()) return;
      items.value = page.items;
      total.value = page.total;
    } catch (error) {
      if (isAbort(error)) return;
      throw error;
    } finally {
      if (isCurrent()) loading.value = false;
    }
  }

  async function loadRecent(limit = 5): Promise<void> {
    recent.value = (await auditApi.list({ limit, sort: '-createdAt' })).items;
  }

  return { items, total, loading, recent, load, loadRecent };
});
