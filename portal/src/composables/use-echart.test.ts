import { mount } from '@vue/test-utils';
import type { EChartsCoreOption } from 'echarts/core';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h, nextTick } from 'vue';
import { canvasAvailable, readEChartInk, renderChartSvg, useEChart, type EChartInk } from './use-echart';
import { useColorScheme } from './use-color-scheme';

const mounted: { unmount(): void }[] = [];

function line(ink: EChartInk): EChartsCoreOption {
  return {
    animation: false,
    xAxis: { type: 'value' },
    yAxis: { type: 'value' },
    series: [{ type: 'line', name: ink.dark ? 'dark' : 'light', data: [[1, 2], [2, 3], [3, 5]], itemStyle: { color: ink.dark ? '#56b4e9' : '#0072b2' } }],
  };
}

function mountChart(build: (ink: EChartInk) => EChartsCoreOption | null) {
  let exposed!: ReturnType<typeof useEChart>;
  const Host = defineComponent({
    setup() {
      exposed = useEChart(build);
      return () => h('div');
    },
  });
  const wrapper = mount(Host);
  mounted.push(wrapper);
  return exposed;
}

describe('useEChart', () => {
  afterEach(() => {
    mounted.splice(0).forEach((w) => w.unmount());
    vi.restoreAllMocks();
  });

  describe('drawing', () => {
    it('should not draw where there is no canvas (the test DOM), so the page shows the table alone', async () => {
      const chart = mountChart(line);
      await nextTick();
      expect(canvasAvailable()).toBe(false);
      expect(chart.canDraw.value).toBe(false);
      expect(chart.png()).toBeNull();
    });

    it('should draw where a canvas answers', async () => {
      vi.spyOn(HTMLCanvasElement.prototype, 'getContext').mockReturnValue({} as never);
      const chart = mountChart(line);
      await nextTick();
      expect(chart.canDraw.value).toBe(true);
    });

    it('should build the option again in the other scheme when light and dark swap', async () => {
      const { isDark, toggle } = useColorScheme();
      const chart = mountChart(line);
      const first = isDark.value ? 'dark' : 'light';
      expect((chart.option.value as { series: { name: string }[] }).series[0].name).toBe(first);
      toggle();
      await nextTick();
      expect((chart.option.value as { series: { name: string }[] }).series[0].name).toBe(first === 'dark' ? 'light' : 'dark');
      toggle();
    });
  });

  describe('the palette', () => {
    it('should read the colours from the page’s variables, with fallbacks where the theme is not loaded', () => {
      document.documentElement.style.setProperty('--lcs-card-bg', '#fafaf9');
      const ink = readEChartInk(false);
      expect(ink.background).toBe('#fafaf9');
      expect(ink.accent).toMatch(/^#/);
      expect(ink.dark).toBe(false);
      document.documentElement.style.removeProperty('--lcs-card-bg');
      expect(readEChartInk(true).background).toBe('#1c1917');
    });
  });

  describe('exporting SVG', () => {
    it('should render an SVG document of the option, with the card’s background, without a canvas', async () => {
      const svg = await renderChartSvg(line(readEChartInk(false)), { width: 640, height: 360, background: '#ffffff' });
      expect(svg.startsWith('<svg')).toBe(true);
      expect(svg).toContain('width="640"');
      expect(svg).toContain('height="360"');
      expect(svg).toContain('fill="#ffffff"');
      expect(svg).toContain('#0072b2');
    });

    it('should export at a standard size when nothing is drawn on screen, and nothing when there is nothing to draw', async () => {
      const chart = mountChart(line);
      expect(await chart.svg()).toContain('width="960"');
      const empty = mountChart(() => null);
      expect(await empty.svg()).toBeNull();
    });
  });
});
