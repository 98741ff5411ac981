import type { Person, PersonInput, PersonPatch, Role } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { peopleApi } from '../api/people.api';
import { usePagedList } from './paged-list';

export const usePeopleStore = defineStore('people', () => {
  const { items, total, loading, load } = usePagedList(peopleApi.list);
  const unlinked = ref<{ count: number; first: Person[] } | null>(null);

  /** Accounts the office added that nobody has signed in to yet: how many, and the newest five. */
  async function loadUnlinked(): Promise<void> {
    const page = await peopleApi.list({ linked: 'false', limit: 5, sort: '-createdAt' });
    unlinked.value = { count: page.total, first: page.items };
  }

  function replace(person: Person): Person {
    items.value = items.value.map((p) => (p.id === person.id ? person : p));
    return person;
  }

  async function create(input: PersonInput): Promise<Person> {
    const person = await peopleApi.create(input);
    items.value = [person, ...items.value];
    total.value += 1;
    return person;
  }

  const update = async (id: string, patch: PersonPatch) => replace(await peopleApi.update(id, patch));
  const grantRole = async (id: string, role: Role) => replace(await peopleApi.grantRole(id, role));
  const revokeRole = async (id: string, role: Role) => replace(await peopleApi.revokeRole(id, role));

  return { items, total, loading, unlinked, load, loadUnlinked, create, update, grantRole, revokeRole };
});
