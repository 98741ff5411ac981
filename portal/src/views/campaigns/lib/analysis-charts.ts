import type { ScalingAnalysis } from '@localis/shared';
import type { CustomSeriesOption, LineSeriesOption, ScatterSeriesOption } from 'echarts/charts';
import type { GridComponentOption, LegendComponentOption, MarkAreaComponentOption, MarkLineComponentOption, TooltipComponentOption } from 'echarts/components';
import type { ComposeOption, EChartsCoreOption } from 'echarts/core';
import type { EChartInk } from '../../../composables/use-echart';
import { seriesColor } from '../../../theme/chart-palette';
import { formatInterval, formatSignificant, observableSymbol } from './analysis-format';
import { measuredPoints } from './analysis-tables';

/**
 * The analysis page's three charts as ECharts options, built from the result alone (pure, so they
 * are tested without a canvas): the observable against W for each L with error bars, the data
 * collapse on the scaling variable with the fitted curve, and the numerical beta function. The
 * colours come in as `ChartInk`, read from the page's palette by `useEChart`.
 */

/** The colours a chart is drawn in (text, grid, background, accent), read from the page by `useEChart`. */
export type ChartInk = EChartInk;

type Option = ComposeOption<
  | LineSeriesOption
  | ScatterSeriesOption
  | CustomSeriesOption
  | GridComponentOption
  | LegendComponentOption
  | TooltipComponentOption
  | MarkLineComponentOption
  | MarkAreaComponentOption
>;

/** Shapes beside the colours, so sizes stay apart in grey print and for colour-blind readers. */
const SYMBOLS = ['circle', 'rect', 'triangle', 'diamond', 'emptyCircle', 'emptyRect', 'emptyTriangle'] as const;
export const symbolOf = (index: number) => SYMBOLS[index % SYMBOLS.length];

/** One error bar: the point, its vertical span and (for beta) its horizontal span. */
export interface ErrorBar {
  x: number;
  y: number;
  yError: number;
  xError?: number;
}

type CustomSeriesRenderItem = NonNullable<CustomSeriesOption['renderItem']>;

const CAP = 3;

/** Draws each bar as a line with caps; the data are [x, y, yLo, yHi, xLo, xHi]. */
function errorBarRenderer(color: string): CustomSeriesRenderItem {
  return (_params, api) => {
    const at = (x: number, y: number) => api.coord([x, y]);
    const [x, y, yLo, yHi, xLo, xHi] = [0, 1, 2, 3, 4, 5].map((d) => Number(api.value(d)));
    const segment = (a: number[], b: number[]) => ({ type: 'line' as const, shape: { x1: a[0], y1: a[1], x2: b[0], y2: b[1] }, style: { stroke: color, lineWidth: 1 } });
    const lo = at(x, yLo);
    const hi = at(x, yHi);
    const children = [segment(lo, hi), segment([lo[0] - CAP, lo[1]], [lo[0] + CAP, lo[1]]), segment([hi[0] - CAP, hi[1]], [hi[0] + CAP, hi[1]])];
    if (xHi > xLo) {
      const left = at(xLo, y);
      const right = at(xHi, y);
      children.push(segment(left, right), segment([left[0], left[1] - CAP], [left[0], left[1] + CAP]), segment([right[0], right[1] - CAP], [right[0], right[1] + CAP]));
    }
    return { type: 'group', children };
  };
}

/**
 * Error bars as a custom series of the same name as its points, so the legend shows and hides
 * both together. The spans are encoded on the axes, so the axes make room for whole bars.
 */
export function errorBarSeries(name: string, color: string, bars: readonly ErrorBar[]): CustomSeriesOption {
  return {
    type: 'custom',
    name,
    silent: true,
    clip: true,
    z: 1,
    renderItem: errorBarRenderer(color),
    encode: { x: [0, 4, 5], y: [1, 2, 3] },
    itemStyle: { color },
    data: bars.map((b) => [b.x, b.y, b.y - b.yError, b.y + b.yError, b.x - (b.xError ?? 0), b.x + (b.xError ?? 0)]),
  };
}

/** A lone letter (W, Λ, ψ, β) is a symbol and set in italics; "ln Λ" or "Λ (corrected)" is not. */
const nameStyle = (ink: ChartInk, name: string) => ({ color: ink.text, fontSize: 13, fontStyle: /^\p{L}$/u.test(name) ? ('italic' as const) : ('normal' as const) });

function axes(ink: ChartInk, xName: string, yName: string): Pick<Option, 'xAxis' | 'yAxis'> {
  const common = {
    type: 'value' as const,
    scale: true,
    nameLocation: 'middle' as const,
    // At the plot's edges, not through zero: psi and beta run through zero and an axis there hides points.
    axisLine: { onZero: false, lineStyle: { color: ink.muted } },
    axisTick: { lineStyle: { color: ink.muted } },
    axisLabel: { color: ink.muted, hideOverlap: true },
    splitLine: { lineStyle: { color: ink.grid } },
  };
  // The y name stands upright above its axis: a lone Λ or β turned on its side reads as another letter.
  return {
    xAxis: { ...common, name: xName, nameGap: 28, nameTextStyle: nameStyle(ink, xName) },
    yAxis: { ...common, name: yName, nameLocation: 'end', nameRotate: 0, nameGap: 12, nameTextStyle: nameStyle(ink, yName) },
  };
}

/** What every chart shares: text, legend above the plot, tooltips on the points. */
function frame(ink: ChartInk, legendCount: number): Option {
  return {
    animation: false,
    textStyle: { fontFamily: 'Lato, system-ui, sans-serif', color: ink.text },
    grid: { left: 56, right: 20, top: legendCount > 5 ? 76 : 56, bottom: 48 },
    legend: { top: 0, left: 'center', textStyle: { color: ink.text }, itemWidth: 14, itemHeight: 10, inactiveColor: ink.grid },
    tooltip: { trigger: 'item', confine: true },
  };
}

/** On a phone the legend wraps to more lines: the plot starts lower. */
function responsive(base: Option, legendCount: number): EChartsCoreOption {
  const rows = Math.ceil(legendCount / 3);
  // The root form of a media option (no `baseOption`), which ECharts reads as the base itself.
  return { ...base, media: [{ query: { maxWidth: 520 }, option: { grid: { top: 34 + rows * 22, left: 48, right: 12 } } }] };
}

const tooltipLines = (lines: string[]) => lines.join('<br>');

function bySize<T extends { L: number }>(points: readonly T[]): [number, T[]][] {
  const groups = new Map<number, T[]>();
  for (const p of points) groups.set(p.L, [...(groups.get(p.L) ?? []), p]);
  return [...groups.entries()].sort((a, b) => a[0] - b[0]);
}

/** The observable against W (or E), one coloured line of points per L, the fitted critical point as a band. */
export function pointsChartOption(result: ScalingAnalysis, ink: ChartInk): EChartsCoreOption {
  const v = result.model.variable;
  const symbol = observableSymbol(result.model.observable);
  const groups = bySize(measuredPoints(result));
  const series: Option['series'] = [];
  groups.forEach(([L, points], i) => {
    const color = seriesColor(i, ink.dark);
    const name = `L = ${L}`;
    const sorted = [...points].sort((a, b) => a.x - b.x);
    series.push({
      type: 'line',
      name,
      data: sorted.map((p) => [p.x, p.value, p.error]),
      symbol: symbolOf(i),
      symbolSize: 7,
      itemStyle: { color },
      lineStyle: { color, width: 1, opacity: 0.55 },
      z: 3,
      tooltip: { formatter: (p: unknown) => pointTooltip(name, v, symbol, (p as { value: number[] }).value) },
    });
    series.push(errorBarSeries(name, color, sorted.map((p) => ({ x: p.x, y: p.value, yError: p.error }))));
  });
  const wc = formatInterval(result.Wc);
  const criticalName = `${v}c (95 %)`;
  series.push({
    type: 'line',
    name: criticalName,
    data: [],
    itemStyle: { color: ink.accent },
    lineStyle: { color: ink.accent },
    markArea: { silent: true, itemStyle: { color: ink.accent, opacity: 0.14 }, data: [[{ xAxis: result.Wc.lo }, { xAxis: result.Wc.hi }]] },
    markLine: {
      silent: true,
      symbol: 'none',
      lineStyle: { color: ink.accent, type: 'dashed', width: 1.5 },
      label: { formatter: `${v}c = ${wc.value}`, color: ink.text, position: 'insideEndTop' },
      data: [{ xAxis: result.Wc.value }],
    },
  });
  const legend = groups.length + 1;
  return responsive({ ...frame(ink, legend), ...axes(ink, v, symbol), series }, legend);
}

function pointTooltip(name: string, v: string, symbol: string, value: number[]): string {
  return tooltipLines([name, `${v} = ${formatSignificant(value[0], 6)}`, `${symbol} = ${formatSignificant(value[1])} ± ${formatSignificant(value[2], 2)}`]);
}

/** The data collapse: every point on psi = chi_r(w) L^(1/nu), coloured by L, and the fitted scaling function. */
export function collapseChartOption(result: ScalingAnalysis, ink: ChartInk): EChartsCoreOption {
  const symbol = observableSymbol(result.model.observable);
  const v = result.model.variable;
  const groups = bySize(result.collapse.points);
  const series: Option['series'] = [];
  groups.forEach(([L, points], i) => {
    const color = seriesColor(i, ink.dark);
    const name = `L = ${L}`;
    series.push({
      type: 'scatter',
      name,
      data: points.map((p) => [p.scalingVariable, p.value, p.error, p.x]),
      symbol: symbolOf(i),
      symbolSize: 7,
      itemStyle: { color },
      z: 3,
      tooltip: {
        formatter: (p: unknown) => {
          const [psi, value, error, x] = (p as { value: number[] }).value;
          return tooltipLines([name, `${v} = ${formatSignificant(x, 6)}`, `ψ = ${formatSignificant(psi)}`, `${symbol} = ${formatSignificant(value)} ± ${formatSignificant(error, 2)}`]);
        },
      },
    });
    series.push(errorBarSeries(name, color, points.map((p) => ({ x: p.scalingVariable, y: p.value, yError: p.error }))));
  });
  series.push({
    type: 'line',
    name: 'fitted scaling function',
    data: result.collapse.curve.map((c) => [c.scalingVariable, c.value]),
    showSymbol: false,
    silent: true,
    itemStyle: { color: ink.text },
    lineStyle: { color: ink.text, width: 1.5 },
    z: 4,
  });
  const legend = groups.length + 1;
  const yName = result.model.ni > 0 ? `${symbol} (corrected)` : symbol;
  return responsive({ ...frame(ink, legend), ...axes(ink, 'ψ', yName), series }, legend);
}

/** The numerical beta function against ln of the observable, one colour per pair of sizes; beta = 0 marks the transition. */
export function betaChartOption(result: ScalingAnalysis, ink: ChartInk): EChartsCoreOption {
  const symbol = observableSymbol(result.model.observable);
  const v = result.model.variable;
  const pairs = new Map<string, ScalingAnalysis['beta']>();
  for (const b of result.beta) {
    const key = `${b.sizes[0]}–${b.sizes[1]}`;
    pairs.set(key, [...(pairs.get(key) ?? []), b]);
  }
  const series: Option['series'] = [];
  [...pairs.entries()].forEach(([key, points], i) => {
    const color = seriesColor(i, ink.dark);
    const name = `L = ${key}`;
    series.push({
      type: 'scatter',
      name,
      data: points.map((b) => [b.lnValue, b.beta, b.betaError, b.lnValueError, b.x]),
      symbol: symbolOf(i),
      symbolSize: 7,
      itemStyle: { color },
      z: 3,
      tooltip: {
        formatter: (p: unknown) => {
          const [ln, beta, betaError, lnError, x] = (p as { value: number[] }).value;
          return tooltipLines([name, `${v} = ${formatSignificant(x, 6)}`, `ln ${symbol} = ${formatSignificant(ln)} ± ${formatSignificant(lnError, 2)}`, `β = ${formatSignificant(beta)} ± ${formatSignificant(betaError, 2)}`]);
        },
      },
    });
    series.push(errorBarSeries(name, color, points.map((b) => ({ x: b.lnValue, y: b.beta, yError: b.betaError, xError: b.lnValueError }))));
  });
  // The zero line: where beta changes sign the system neither localizes nor delocalizes as L grows.
  series.push({
    type: 'line',
    name: 'β = 0',
    data: [],
    itemStyle: { color: ink.accent },
    markLine: { silent: true, symbol: 'none', lineStyle: { color: ink.accent, type: 'dashed', width: 1.5 }, label: { show: false }, data: [{ yAxis: 0 }] },
  });
  const legend = pairs.size + 1;
  return responsive({ ...frame(ink, legend), ...axes(ink, `ln ${symbol}`, 'β'), series }, legend);
}

/** What a screen reader hears for each chart: what is drawn and what it shows, in one sentence or two. */
export function chartSummaries(result: ScalingAnalysis): { points: string; collapse: string; beta: string } {
  const v = result.model.variable;
  const symbol = observableSymbol(result.model.observable);
  const sizes = result.model.sizes.join(', ');
  const wc = formatInterval(result.Wc);
  const nu = formatInterval(result.nu);
  return {
    points:
      `Chart of ${symbol} against ${v} for sizes L = ${sizes}, ${result.model.points} points with error bars. ` +
      `The fitted critical point ${v}c = ${wc.text} is marked. The table below lists every point.`,
    collapse:
      `Chart of the data collapse: ${symbol} against the scaling variable ψ for sizes L = ${sizes}, with the fitted scaling function ` +
      `(ν = ${nu.text}). The table below lists every point.`,
    beta: `Chart of the numerical β function against ln ${symbol}, ${result.beta.length} points from successive sizes, with the line β = 0. The table below lists every point.`,
  };
}
