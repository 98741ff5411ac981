import type { Person, PersonInput, PersonPatch, Role } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { peopleApi, type PeopleQuery } from '../api/people.api';
import { isAbort, latestOnly } from './latest-only';

/** How many recent accounts the home page looks through for ones never signed in. */
const UNLINKED_SCAN = 100;

export const usePeopleStore = defineStore('people', () => {
  const items = ref<Person[]>([]);
  const total = ref(0);
  const loading = ref(false);
  const unlinked = ref<{ count: number; scanned: number; first: Person[] } | null>(null);

  const lists = latestOnly();

  async function load(query: PeopleQuery): Promise<void> {
    const { signal, isCurrent } = lists.begin();
    loading.value = true;
    try {
      const page = await peopleApi.list(query, signal);
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

  /** Accounts the office added that nobody has signed in to yet, among the most recent ones. */
  async function loadUnlinked(): Promise<void> {
    const page = await peopleApi.list({ limit: UNLINKED_SCAN, sort: '-createdAt' });
    const never = page.items.filter((p) => !p.linked);
    unlinked.value = { count: never.length, scanned: page.items.length, first: never.slice(0, 5) };
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
