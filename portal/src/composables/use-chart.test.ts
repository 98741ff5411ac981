import { mount } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h, nextTick, ref, type Ref } from 'vue';
import { useChart } from './use-chart';
import { useColorScheme } from './use-color-scheme';

// chart.js needs a real 2D context, which the test DOM has not: the charts made are recorded instead.
const charts = vi.hoisted(() => ({ made: [] as { label: unknown; destroyed: boolean }[] }));
vi.mock('chart.js', () => ({
  Chart: class {
    private readonly made: { label: unknown; destroyed: boolean };
    constructor(_context: unknown, config: { data: { datasets: { label: string }[] } }) {
      this.made = { label: config.data.datasets[0].label, destroyed: false };
      charts.made.push(this.made);
    }
    destroy(): void {
      this.made.destroyed = true;
    }
  },
}));

const mounted: { unmount(): void }[] = [];
const unmountAll = () => mounted.splice(0).forEach((wrapper) => wrapper.unmount());

function mountChart(points: Ref<number[]>) {
  const Host = defineComponent({
    setup() {
      const canvas = useChart(
        (dark) => (points.value.length ? { type: 'line' as const, data: { datasets: [{ label: `${dark ? 'dark' : 'light'} ${points.value.join(',')}`, data: [...points.value] }] } } : null),
        [points],
        { deep: true },
      );
      return () => h('canvas', { ref: canvas });
    },
  });
  const wrapper = mount(Host);
  mounted.push(wrapper);
  return wrapper;
}

describe('useChart', () => {
  beforeEach(() => {
    charts.made = [];
    vi.spyOn(HTMLCanvasElement.prototype, 'getContext').mockReturnValue({} as never);
  });

  afterEach(() => {
    unmountAll();
    vi.restoreAllMocks();
  });

  describe('drawing', () => {
    it('should draw once mounted and draw again, the old chart destroyed, when a source changes', async () => {
      const points = ref([1, 2]);
      mountChart(points);
      expect(charts.made).toEqual([{ label: 'light 1,2', destroyed: false }]);

      points.value.push(3);
      await nextTick();
      expect(charts.made).toEqual([
        { label: 'light 1,2', destroyed: true },
        { label: 'light 1,2,3', destroyed: false },
      ]);
    });

    it('should draw again in the other scheme when light and dark swap', async () => {
      const { isDark, toggle } = useColorScheme();
      const before = isDark.value;
      mountChart(ref([1]));
      toggle();
      await nextTick();
      toggle();
      await nextTick();
      const [first, second] = before ? ['dark', 'light'] : ['light', 'dark'];
      expect(charts.made.map((c) => c.label)).toEqual([`${first} 1`, `${second} 1`, `${first} 1`]);
    });

    it('should draw nothing while there is nothing to draw, or no 2D context to draw on', async () => {
      const points = ref<number[]>([]);
      mountChart(points);
      vi.mocked(HTMLCanvasElement.prototype.getContext).mockReturnValue(null);
      points.value.push(1);
      await nextTick();
      expect(charts.made).toEqual([]);
    });
  });

  describe('cleaning up', () => {
    it('should destroy the chart with the component', () => {
      mountChart(ref([1]));
      unmountAll();
      expect(charts.made).toEqual([{ label: 'light 1', destroyed: true }]);
    });
  });
});
