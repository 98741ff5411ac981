import { describe, expect, it } from 'vitest';
import { nextTick, ref } from 'vue';
import { ApiError } from '../../../../api/api-error';
import { useRoundForm } from './use-round-form';

describe('useRoundForm', () => {
  describe('errors beside the fields', () => {
    it('should show no pool errors before the first attempt to save', () => {
      const { pools } = useRoundForm(ref(null));
      expect(pools.value).toEqual({ rows: {} });
    });

    it('should place each empty or wrong pool field beside its row when saving fails the schema', () => {
      const { form, values, errors, pools, addPool } = useRoundForm(ref(null));
      values.value.name = 'Spring 2027';
      values.value.opensAt = '2027-01-15T00:00:00.000Z';
      values.value.closesAt = '2027-03-31T00:00:00.000Z';
      values.value.pools[0].machine = 'cluster-a';
      addPool();

      expect(form.validate()).toBeNull();
      expect(errors.value.pools).toBeDefined();
      expect(pools.value.rows[0]).toEqual({ coreHours: 'enter the core-hours of this pool' });
      expect(pools.value.rows[1]).toEqual({ machine: expect.stringMatching(/lower-case/), coreHours: 'enter the core-hours of this pool' });
    });

    it('should clear the pool errors as the person fixes them', async () => {
      const { form, values, pools, removePool } = useRoundForm(ref(null));
      Object.assign(values.value, { name: 'Spring 2027', opensAt: '2027-01-15T00:00:00Z', closesAt: '2027-03-31T00:00:00Z' });
      expect(form.validate()).toBeNull();
      values.value.pools[0] = { machine: 'cluster-a', coreHours: 1000 };
      await nextTick();
      expect(pools.value.rows).toEqual({});
      removePool(0);
      await nextTick();
      expect(pools.value.list).toBe('a round needs a pool of core-hours on at least one machine');
    });

    it('should put the server details beside the row they name when the api refuses', () => {
      const { form, pools } = useRoundForm(ref(null));
      form.applyServerErrors(new ApiError(422, 'invalid', 'Check the pools', [{ path: ['pools', 0, 'coreHours'], message: 'less than already granted' }]));
      expect(pools.value.rows[0]?.coreHours).toBe('less than already granted');
    });
  });
});
