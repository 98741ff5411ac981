import { flushPromises, type VueWrapper } from '@vue/test-utils';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import { mountInApp, resetTestPage } from '../../../../test/mount-in-app';
import { collapseChartOption } from '../../lib/analysis-charts';
import { scalingResultFixture } from '../../lib/analysis-fixture';
import { collapseCurveTable, collapseTable } from '../../lib/analysis-tables';
import AnalysisFigure from './analysis-figure.vue';

// ECharts cannot draw in the test DOM; where a canvas is claimed, the chart component is a stand-in
// that records the option it gets and answers for its PNG as the real one would.
const drawn = vi.hoisted(() => ({ options: [] as unknown[], pngAsked: [] as unknown[] }));
vi.mock('vue-echarts', () => ({
  default: defineComponent({
    props: { option: { type: Object, required: true }, autoresize: Boolean },
    setup(props, { expose }) {
      drawn.options.push(props.option);
      expose({
        getDataURL: (opts: unknown) => (drawn.pngAsked.push(opts), 'data:image/png;base64,iVBORw0K'),
        getWidth: () => 700,
        getHeight: () => 350,
      });
      return () => h('div', { class: 'chart-stand-in' });
    },
  }),
}));

const result = scalingResultFixture();
const SOURCE = { analysisId: '5e6f7a8b-9c0d-4e1f-8a2b-3c4d5e6f7a8b', campaignId: '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d', finishedAt: null };
let host: VueWrapper | undefined;

async function mountFigure() {
  host = await mountInApp(
    defineComponent({
      render: () =>
        h(AnalysisFigure, {
          what: 'collapse',
          title: 'Data collapse',
          build: (ink) => collapseChartOption(result, ink),
          summary: 'Chart of the data collapse.',
          caption: 'Every point on ψ.',
          tables: [collapseTable(result), collapseCurveTable(result)],
          campaignTitle: 'Critical disorder of the 3D Anderson model',
          source: SOURCE,
        }),
    }),
  );
  await flushPromises();
  return host;
}

function captureDownloads() {
  const files: { name: string; blob: Blob }[] = [];
  let last: Blob | null = null;
  vi.spyOn(URL, 'createObjectURL').mockImplementation((b) => ((last = b as Blob), 'blob:figure'));
  vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => undefined);
  vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
    if (last) files.push({ name: this.download, blob: last });
  });
  return files;
}

describe('AnalysisFigure', () => {
  beforeEach(() => {
    drawn.options = [];
    drawn.pngAsked = [];
  });

  afterEach(() => {
    host?.unmount();
    host = undefined;
    resetTestPage();
    vi.restoreAllMocks();
  });

  describe('where a canvas can draw', () => {
    beforeEach(() => {
      // Enough of a 2D context for ECharts to measure its labels with.
      vi.spyOn(HTMLCanvasElement.prototype, 'getContext').mockReturnValue({ font: '', measureText: (text: string) => ({ width: text.length * 6 }) } as never);
    });

    it('should draw the chart with its summary as the image’s label, its numbers folded below', async () => {
      const wrapper = await mountFigure();
      const box = wrapper.get('[data-testid="chart-collapse"]');
      expect(box.attributes('role')).toBe('img');
      expect(box.attributes('aria-label')).toBe('Chart of the data collapse.');
      expect(drawn.options).toHaveLength(1);
      expect(wrapper.get('details').attributes('open')).toBeUndefined();
      expect(wrapper.findAll('details table')).toHaveLength(2);
      expect(wrapper.get('figure').attributes('aria-labelledby')).toBe('figure-collapse-heading');
    });

    it('should export the chart on screen as a PNG at twice its pixels, on the card’s background', async () => {
      const files = captureDownloads();
      const wrapper = await mountFigure();
      await wrapper.get('[data-testid="export-collapse-png"]').trigger('click');
      expect(drawn.pngAsked).toEqual([{ type: 'png', pixelRatio: 2, backgroundColor: expect.any(String) }]);
      expect(files[0].name).toBe('localis-critical-disorder-of-the-3d-anderson-model-collapse.png');
      expect(files[0].blob.type).toBe('image/png');
    });

    it('should export an SVG at the size the chart has on screen', async () => {
      const files = captureDownloads();
      const wrapper = await mountFigure();
      await wrapper.get('[data-testid="export-collapse-svg"]').trigger('click');
      await vi.waitFor(() => expect(files).toHaveLength(1));
      const svg = await files[0].blob.text();
      expect(svg).toContain('width="700"');
      expect(svg).toContain('height="350"');
    });
  });

  describe('where nothing can be drawn', () => {
    it('should say what the chart would show and open its tables', async () => {
      const wrapper = await mountFigure();
      expect(wrapper.find('.chart-stand-in').exists()).toBe(false);
      expect(wrapper.get('[data-testid="no-chart-collapse"]').text()).toBe('Chart of the data collapse.');
      expect(wrapper.get('details').attributes('open')).toBeDefined();
      expect(wrapper.get('[data-testid="export-collapse-png"]').attributes('disabled')).toBeDefined();
      expect(wrapper.find('[data-testid="download-collapse-csv"]').exists()).toBe(true);
      expect(wrapper.find('[data-testid="download-collapse-curve-json"]').exists()).toBe(true);
    });
  });
});
