import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import { describe, expect, it } from 'vitest';
import { defineComponent, ref } from 'vue';
import { useTableLoad } from './use-table-load';

function setup(blocked = ref(false)) {
  const query = ref({ limit: 25, offset: 0 });
  const asked: { limit: number; offset: number }[] = [];
  const Probe = defineComponent({
    setup() {
      useTableLoad({ query, load: async (q) => void asked.push(q), blocked: () => blocked.value, failure: 'Rows could not be loaded' });
      return () => null;
    },
  });
  mount(Probe, { global: { plugins: [[PrimeVue, { theme: 'none' }], ToastService] } });
  return { query, asked, blocked };
}

describe('useTableLoad', () => {
  describe('when to load', () => {
    it('should load at once and again when the query changes', async () => {
      const { query, asked } = setup();
      await flushPromises();
      query.value = { limit: 25, offset: 25 };
      await flushPromises();
      expect(asked).toEqual([
        { limit: 25, offset: 0 },
        { limit: 25, offset: 25 },
      ]);
    });

    it('should not load again when the query is rebuilt with the same values', async () => {
      const { query, asked } = setup();
      await flushPromises();
      query.value = { limit: 25, offset: 0 };
      await flushPromises();
      expect(asked).toHaveLength(1);
    });

    it('should not load when the query is blocked', async () => {
      const { asked } = setup(ref(true));
      await flushPromises();
      expect(asked).toEqual([]);
    });
  });
});
