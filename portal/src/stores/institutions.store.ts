import type { Institution, InstitutionInput, InstitutionPatch } from '@localis/shared';
import { MAX_PAGE_SIZE } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { institutionsApi } from '../api/institutions.api';
import { usePagedList } from './paged-list';

export const useInstitutionsStore = defineStore('institutions', () => {
  /** One page of the admin table. */
  const { items, total, loading, load } = usePagedList(institutionsApi.list);
  /** Every institution by name, for the Select fields of other forms. */
  const options = ref<Institution[]>([]);
  const optionsLoaded = ref(false);

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
