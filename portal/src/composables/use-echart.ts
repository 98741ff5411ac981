import { CustomChart, LineChart, ScatterChart } from 'echarts/charts';
import { GridComponent, LegendPlainComponent, MarkAreaComponent, MarkLineComponent, TooltipComponent } from 'echarts/components';
import { init, use, type EChartsCoreOption } from 'echarts/core';
import { CanvasRenderer, SVGRenderer } from 'echarts/renderers';
import { computed, onMounted, ref, shallowRef } from 'vue';
import { chartInk } from '../theme/chart-palette';
import { useColorScheme } from './use-color-scheme';

// Only what the charts use, registered once: the whole of ECharts would triple the page's weight.
use([LineChart, ScatterChart, CustomChart, GridComponent, LegendPlainComponent, TooltipComponent, MarkLineComponent, MarkAreaComponent, CanvasRenderer, SVGRenderer]);

/** The colours an ECharts chart is drawn in, from the page's palette (see `theme/chart-palette.ts`). */
export interface EChartInk {
  dark: boolean;
  text: string;
  muted: string;
  grid: string;
  background: string;
  accent: string;
}

/** The scheme's colours, read from the preset's variables so charts follow light and dark. */
export function readEChartInk(dark: boolean): EChartInk {
  const style = getComputedStyle(document.documentElement);
  const read = (name: string, fallback: string) => style.getPropertyValue(name).trim() || fallback;
  return {
    dark,
    ...chartInk(),
    background: read('--lcs-card-bg', dark ? '#1c1917' : '#ffffff'),
    accent: read('--p-primary-color', dark ? '#2dd4bf' : '#0f766e'),
  };
}

/** Whether this browser can draw on a canvas at all (a test DOM, a locked-down browser cannot). */
export function canvasAvailable(): boolean {
  try {
    return !!document.createElement('canvas').getContext('2d');
  } catch {
    return false;
  }
}

/**
 * The chart as an SVG document, drawn by ECharts' SVG renderer without the page (server-side
 * mode): needs no canvas, so it works wherever the page does.
 */
export function renderChartSvg(option: EChartsCoreOption, size: { width: number; height: number; background: string }): string {
  const chart = init(null, null, { renderer: 'svg', ssr: true, width: size.width, height: size.height });
  try {
    // A background of its own: on screen the card shows through, in a file nothing would.
    chart.setOption({ ...option, backgroundColor: size.background, animation: false });
    return chart.renderToSVGString();
  } finally {
    chart.dispose();
  }
}

/** What the page needs of a drawn chart (vue-echarts' component exposes it). */
export interface DrawnChart {
  getDataURL(opts?: { type?: 'png' | 'jpeg' | 'svg'; pixelRatio?: number; backgroundColor?: string }): string;
  getWidth(): number;
  getHeight(): number;
}

/** The size of an exported SVG when nothing is drawn on screen to copy it from. */
const EXPORT_SIZE = { width: 960, height: 540 };

/**
 * An ECharts chart for vue-echarts' `<VChart ref="chart" :option="option">`: the option is built
 * from the page's colours and built again when light and dark swap. `canDraw` is false until
 * mounted and where there is no canvas: the page then shows the chart's table alone (every chart
 * has one). `png()` copies the chart on screen; `svg()` draws it again with the SVG renderer, at
 * the size it has on screen.
 */
export function useEChart(build: (ink: EChartInk) => EChartsCoreOption | null) {
  const { isDark } = useColorScheme();
  const canDraw = ref(false);
  const chart = shallowRef<DrawnChart | null>(null);
  const ink = computed(() => readEChartInk(isDark.value));
  const option = computed(() => build(ink.value));

  onMounted(() => {
    canDraw.value = canvasAvailable();
  });

  /** The chart on screen as a PNG `data:` URL, at twice its pixels; null when nothing is drawn. */
  function png(): string | null {
    if (!chart.value || !option.value) return null;
    return chart.value.getDataURL({ type: 'png', pixelRatio: 2, backgroundColor: ink.value.background });
  }

  /** The chart as an SVG document; null when there is nothing to draw. */
  function svg(): string | null {
    if (!option.value) return null;
    const width = chart.value?.getWidth() || EXPORT_SIZE.width;
    const height = chart.value?.getHeight() || EXPORT_SIZE.height;
    return renderChartSvg(option.value, { width, height, background: ink.value.background });
  }

  return { chart, option, canDraw, ink, png, svg };
}
