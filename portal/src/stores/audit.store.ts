import type { AuditEntry } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { auditApi } from '../api/audit.api';
import { usePagedList } from './paged-list';

export const useAuditStore = defineStore('audit', () => {
  const { items, total, loading, load } = usePagedList(auditApi.list);
  const recent = ref<AuditEntry[] | null>(null);

  async function loadRecent(limit = 5): Promise<void> {
    recent.value = (await auditApi.list({ limit, sort: '-createdAt' })).items;
  }

  return { items, total, loading, recent, load, loadRecent };
});
