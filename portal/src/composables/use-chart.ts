import { Chart, type ChartConfiguration, type ChartType, type DefaultDataPoint } from 'chart.js';
import { onBeforeUnmount, onMounted, ref, watch, type WatchSource } from 'vue';
import { useColorScheme } from './use-color-scheme';

/**
 * A chart.js chart on the canvas bound to the returned ref (`ref="canvas"`): drawn once mounted,
 * drawn again when a source changes or light and dark swap, destroyed with the component.
 * `config` gets whether the page is dark and answers null when there is nothing to draw. Without a
 * 2D context (a test DOM, a blocked canvas) nothing is drawn: every chart has a table of the same
 * numbers beside it.
 */
export function useChart<TType extends ChartType, TData = DefaultDataPoint<TType>, TLabel = unknown>(
  config: (dark: boolean) => ChartConfiguration<TType, TData, TLabel> | null,
  sources: WatchSource[],
  options: { deep?: boolean } = {},
) {
  const canvas = ref<HTMLCanvasElement | null>(null);
  const { isDark } = useColorScheme();
  let chart: Chart<TType, TData, TLabel> | null = null;

  function draw(): void {
    chart?.destroy();
    chart = null;
    const context = canvas.value?.getContext('2d');
    const next = context ? config(isDark.value) : null;
    if (context && next) chart = new Chart(context, next);
  }

  onMounted(draw);
  watch([...sources, isDark], draw, options);
  onBeforeUnmount(() => chart?.destroy());

  return canvas;
}
