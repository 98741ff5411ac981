import { RoundListQuery } from '@localis/shared';
import { flushPromises, mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import { defineComponent, h } from 'vue';
import { createMemoryHistory, createRouter, RouterView } from 'vue-router';
import {
  listQueryProblem,
  parseTableQuery,
  sortFromTable,
  sortToTable,
  toApiQuery,
  toLocationQuery,
  useTableQuery,
  type TableQuerySpec,
} from './use-table-query';

type PeopleFilter = 'q' | 'role' | 'active';
const spec: TableQuerySpec<PeopleFilter> = {
  filters: ['q', 'role', 'active'],
  sortable: ['name', 'email', 'createdAt'],
  defaultSort: 'name',
};

describe('useTableQuery', () => {
  describe('parseTableQuery', () => {
    it('should give the defaults when the URL has no query', () => {
      expect(parseTableQuery({}, spec)).toEqual({ page: 1, limit: 25, sort: 'name', filters: {} });
    });

    it('should read page, size, sort and filters when they are valid', () => {
      expect(parseTableQuery({ page: '3', limit: '50', sort: '-createdAt', q: ' ada ', role: 'admin', other: 'x' }, spec)).toEqual({
        page: 3,
        limit: 50,
        sort: '-createdAt',
        filters: { q: 'ada', role: 'admin' },
      });
    });

    it('should fall back to defaults when values are nonsense', () => {
      expect(parseTableQuery({ page: '-2', limit: '7', sort: 'password', q: '   ' }, spec)).toEqual({
        page: 1,
        limit: 25,
        sort: 'name',
        filters: {},
      });
    });

    it('should take the first value when a key is repeated', () => {
      expect(parseTableQuery({ role: ['pi', 'admin'], page: ['2', '9'] }, spec)).toMatchObject({ page: 2, filters: { role: 'pi' } });
    });
  });

  describe('toLocationQuery', () => {
    it('should leave out defaults when the state is the default', () => {
      expect(toLocationQuery({ page: 1, limit: 25, sort: 'name', filters: {} }, spec)).toEqual({});
    });

    it('should round-trip through parseTableQuery when the state is not the default', () => {
      const state = { page: 4, limit: 10, sort: '-email', filters: { q: 'kestrel', active: 'false' } };
      const query = toLocationQuery(state, spec) as Record<string, string>;
      expect(query).toEqual({ page: '4', limit: '10', sort: '-email', q: 'kestrel', active: 'false' });
      expect(parseTableQuery(query, spec)).toEqual(state);
    });
  });

  describe('toApiQuery', () => {
    it('should turn the page into an offset when asked for the API query', () => {
      expect(toApiQuery({ page: 3, limit: 25, sort: '-createdAt', filters: { role: 'pi' } })).toEqual({
        limit: 25,
        offset: 50,
        sort: '-createdAt',
        role: 'pi',
      });
    });
  });

  describe('sort mapping', () => {
    it('should map a descending sort to sortOrder -1 when the value starts with a minus', () => {
      expect(sortToTable('-createdAt')).toEqual({ sortField: 'createdAt', sortOrder: -1 });
      expect(sortToTable('name')).toEqual({ sortField: 'name', sortOrder: 1 });
    });

    it('should build the sort value from the table event when the column is sortable', () => {
      expect(sortFromTable('email', -1, spec)).toBe('-email');
      expect(sortFromTable('email', 1, spec)).toBe('email');
    });

    it('should use the default sort when the column is unknown or the sort was removed', () => {
      expect(sortFromTable('secret', 1, spec)).toBe('name');
      expect(sortFromTable('email', 0, spec)).toBe('name');
      expect(sortFromTable(undefined, undefined, spec)).toBe('name');
    });
  });

  describe('listQueryProblem', () => {
    it('should be null when the api would accept the query', () => {
      expect(listQueryProblem(RoundListQuery, { limit: 25, offset: 0, sort: '-opensAt', status: 'open' })).toBeNull();
    });

    it('should name each refused field when the address was edited by hand', () => {
      const problem = listQueryProblem(RoundListQuery, { limit: 25, offset: 0, sort: '-opensAt', status: 'sometime' });
      expect(problem).toMatch(/^status: /);
    });
  });

  describe('binding to the router', () => {
    async function setup(path: string) {
      const router = createRouter({
        history: createMemoryHistory(),
        routes: [{ path: '/people', component: { render: () => null } }],
      });
      let table!: ReturnType<typeof useTableQuery<PeopleFilter>>;
      const Probe = defineComponent({
        setup() {
          table = useTableQuery(spec);
          return () => h(RouterView);
        },
      });
      await router.push(path);
      mount(Probe, { global: { plugins: [router] } });
      await router.isReady();
      return { router, table: () => table };
    }

    it('should write the page and size into the URL when the table pages', async () => {
      const { router, table } = await setup('/people?q=ada');
      await table().onPage({ first: 50, rows: 25 });
      await flushPromises();
      expect(router.currentRoute.value.query).toEqual({ q: 'ada', page: '3' });
      expect(table().apiQuery.value).toMatchObject({ offset: 50, limit: 25, q: 'ada' });
    });

    it('should go back to page 1 when a filter changes', async () => {
      const { router, table } = await setup('/people?page=4&sort=-email&keep=1');
      await table().setFilter('role', 'pi');
      expect(router.currentRoute.value.query).toEqual({ keep: '1', role: 'pi', sort: '-email' });
    });

    it('should drop a filter from the URL when it is cleared', async () => {
      const { router, table } = await setup('/people?role=pi&q=x');
      await table().setFilter('role', null);
      expect(router.currentRoute.value.query).toEqual({ q: 'x' });
      await table().clearFilters();
      expect(router.currentRoute.value.query).toEqual({});
    });

    it('should store a sort and reset the page when the table sorts', async () => {
      const { router, table } = await setup('/people?page=2');
      await table().onSort({ sortField: 'createdAt', sortOrder: -1 });
      expect(router.currentRoute.value.query).toEqual({ sort: '-createdAt' });
      expect(table().tableSort.value).toEqual({ sortField: 'createdAt', sortOrder: -1 });
    });
  });
});
