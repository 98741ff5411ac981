import type { Institution, InstitutionInput, InstitutionPatch } from '@localis/shared';
import { MAX_PAGE_SIZE } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { institutionsApi, type InstitutionsQuery } from '../api/institutions.api';
import { isAbort, latestOnly } from './latest-only';

export const useInstitutionsStore = defineStore('institutions', () => {
  /** One page of the admin table. */
  const items = ref<Institution[]>([]);
  const total = ref(0);
  const loading = ref(false);
  /** Every institution by name, for the Select fields of other forms. */
  const options = ref<Institution[]>([]);
  const optionsLoaded = ref(false);

  const lists = latestOnly();

  async function load(query: InstitutionsQuery): Promise<void> {
    const { signal, isCurrent } = lists.begin();
    loading.value = true;
    try {
      const page = await institutionsApi.list(query, signal);
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

  async function loadOptions(force = false): Promise<void> {
    if (optionsLoaded.value && !force) return;
    const page = await institutionsApi.list({ limit: MAX_PAGE_SIZE, sort: 'name' });
    options.value = page.items;
    optionsLoaded.value = true;
  }

  function remember(institution: Institution): Institution {
    const known = items.value.some((i) => i.id === institution.id);
    items.value = known ? items.value.map((i) => (i.id === institution.id ? institution : i)) : [institution, ...items.value];
    if (!known) total.value += 1;
    const inOptions = options.value.filter((i) => i.id !== institution.id);
    options.value = [...inOptions, institution].sort((a, b) => a.name.localeCompare(b.name));
    return institution;
  }

  const create = async (input: InstitutionInput) => remember(await institutionsApi.create(input));
  const update = async (id: string, patch: InstitutionPatch) => remember(await institutionsApi.update(id, patch));

  return { items, total, loading, options, optionsLoaded, load, loadOptions, create, update };
});
