import { flushPromises, mount } from '@vue/test-utils';
import Column from 'primevue/column';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { defineComponent, h } from 'vue';
import { createMemoryHistory, createRouter, RouterView } from 'vue-router';
import { useTableQuery } from '../composables/use-table-query';
import ServerTable from './server-table.vue';

interface Row {
  id: string;
  name: string;
}

const ROWS: Row[] = [
  { id: 'a', name: 'Ada' },
  { id: 'b', name: 'Bea' },
];

async function setup(options: { items?: Row[]; total?: number; onRowClick?: (row: Row) => void } = {}) {
  const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/people', component: { render: () => null } }] });
  const Host = defineComponent({
    setup() {
      const table = useTableQuery<'q'>({ filters: ['q'], sortable: ['name'], defaultSort: 'name' });
      return () => [
        h(RouterView),
        h(
          ServerTable<Row>,
          { table, items: options.items ?? ROWS, total: options.total ?? 60, loading: false, 'data-testid': 'probe-table', onRowClick: options.onRowClick },
          {
            default: () => [
              h(Column, { field: 'name', header: 'Name', sortable: true }, { body: ({ data }: { data: Row }) => h('strong', data.name) }),
              h(Column, { field: 'id', header: 'Id' }),
            ],
            empty: () => h('p', { class: 'nothing' }, 'Nothing here'),
          },
        ),
      ];
    },
  });
  await router.push('/people');
  const wrapper = mount(Host, { global: { plugins: [router, [PrimeVue, { theme: 'none' }]] } });
  await router.isReady();
  await flushPromises();
  return { router, wrapper };
}

describe('ServerTable', () => {
  describe('what it shows', () => {
    it('should render the columns passed in its slot when given rows', async () => {
      const { wrapper } = await setup();
      const table = wrapper.get('[data-testid="probe-table"]');
      expect(table.findAll('thead th').map((th) => th.text())).toEqual(['Name', 'Id']);
      expect(table.findAll('tbody strong').map((s) => s.text())).toEqual(['Ada', 'Bea']);
    });

    it('should show the empty slot when there are no rows', async () => {
      const { wrapper } = await setup({ items: [], total: 0 });
      expect(wrapper.get('[data-testid="probe-table"] .nothing').text()).toBe('Nothing here');
    });
  });

  describe('the address', () => {
    it('should write the next page into the URL when the paginator moves', async () => {
      const { router, wrapper } = await setup();
      await wrapper.get('.p-paginator-next').trigger('click');
      await flushPromises();
      expect(router.currentRoute.value.query).toEqual({ page: '2' });
    });

    it('should write the sort into the URL when a sortable header is clicked', async () => {
      const { router, wrapper } = await setup();
      await wrapper.get('thead th').trigger('click');
      await flushPromises();
      expect(router.currentRoute.value.query).toEqual({ sort: '-name' });
    });
  });

  describe('row clicks', () => {
    it('should hand over the row and show a pointer when rows open something', async () => {
      const clicked: Row[] = [];
      const { wrapper } = await setup({ onRowClick: (row) => clicked.push(row) });
      await wrapper.findAll('tbody tr')[1].trigger('click');
      expect(clicked).toEqual([ROWS[1]]);
      expect(wrapper.get('[data-testid="probe-table"]').classes()).toContain('rows-open');
    });

    it('should not show a pointer when rows open nothing', async () => {
      const { wrapper } = await setup();
      expect(wrapper.get('[data-testid="probe-table"]').classes()).not.toContain('rows-open');
    });
  });
});
