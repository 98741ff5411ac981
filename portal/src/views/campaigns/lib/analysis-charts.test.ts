import { describe, expect, it } from 'vitest';
import { renderChartSvg } from '../../../composables/use-echart';
import { SERIES_DARK, SERIES_LIGHT } from '../../../theme/chart-palette';
import { betaChartOption, chartSummaries, collapseChartOption, errorBarSeries, pointsChartOption, symbolOf, type ChartInk } from './analysis-charts';
import { scalingResultFixture } from './analysis-fixture';

const result = scalingResultFixture();
const LIGHT: ChartInk = { dark: false, text: '#292524', muted: '#57534e', grid: '#e7e5e4', background: '#ffffff', accent: '#0f766e' };
const DARK: ChartInk = { dark: true, text: '#fafaf9', muted: '#d6d3d1', grid: '#44403c', background: '#1c1917', accent: '#2dd4bf' };

interface SeriesLike {
  type: string;
  name: string;
  data: number[][];
  symbol?: string;
  itemStyle?: { color?: string };
  encode?: unknown;
  markLine?: { data: Record<string, number>[] };
  markArea?: { data: Record<string, number>[][] };
}
interface OptionLike {
  series: SeriesLike[];
  xAxis: { name: string };
  yAxis: { name: string };
  media: { query: { maxWidth: number } }[];
}
const asOption = (o: unknown) => o as OptionLike;
const ofType = (o: OptionLike, type: string) => o.series.filter((s) => s.type === type);

describe('analysis-charts', () => {
  describe('the observable against W', () => {
    const option = asOption(pointsChartOption(result, LIGHT));

    it('should draw one line of points per size, in the palette’s colours and distinct shapes', () => {
      const lines = ofType(option, 'line').filter((s) => s.name.startsWith('L = '));
      expect(lines.map((s) => s.name)).toEqual(['L = 6', 'L = 8', 'L = 10', 'L = 12', 'L = 16']);
      expect(lines.map((s) => s.itemStyle?.color)).toEqual(SERIES_LIGHT.slice(0, 5));
      expect(new Set(lines.map((s) => s.symbol)).size).toBe(5);
      expect(lines.reduce((n, s) => n + s.data.length, 0)).toBe(result.model.points);
      // Points in order of W, so the thin line joins neighbours.
      for (const s of lines) expect(s.data.map((d) => d[0])).toEqual([...s.data.map((d) => d[0])].sort((a, b) => a - b));
    });

    it('should give each size error bars of the same name and colour, spanning value ± error', () => {
      const bars = ofType(option, 'custom');
      expect(bars.map((s) => s.name)).toEqual(['L = 6', 'L = 8', 'L = 10', 'L = 12', 'L = 16']);
      const first = result.collapse.points.filter((p) => p.L === 6).sort((a, b) => a.x - b.x)[0];
      expect(bars[0].data[0]).toEqual([first.x, first.value, first.value - first.error, first.value + first.error, first.x, first.x]);
      expect(bars[0].encode).toEqual({ x: [0, 4, 5], y: [1, 2, 3] });
    });

    it('should mark W_c with its 95 % band', () => {
      const critical = option.series.find((s) => s.name === 'Wc (95 %)')!;
      expect(critical.markLine?.data).toEqual([{ xAxis: result.Wc.value }]);
      expect(critical.markArea?.data).toEqual([[{ xAxis: result.Wc.lo }, { xAxis: result.Wc.hi }]]);
      expect(option.xAxis.name).toBe('W');
      expect(option.yAxis.name).toBe('Λ');
    });

    it('should take the dark palette in the dark scheme', () => {
      const dark = asOption(pointsChartOption(result, DARK));
      expect(ofType(dark, 'line')[0].itemStyle?.color).toBe(SERIES_DARK[0]);
    });

    it('should make room for a wrapped legend on a phone', () => {
      expect(option.media[0].query.maxWidth).toBe(520);
    });
  });

  describe('the collapse', () => {
    it('should put every point on psi with its error bar and add the fitted curve', () => {
      const option = asOption(collapseChartOption(result, LIGHT));
      const points = ofType(option, 'scatter');
      expect(points.reduce((n, s) => n + s.data.length, 0)).toBe(result.collapse.points.length);
      const curve = option.series.find((s) => s.name === 'fitted scaling function')!;
      expect(curve.data).toHaveLength(result.collapse.curve.length);
      expect(option.xAxis.name).toBe('ψ');
      expect(ofType(option, 'custom')).toHaveLength(5);
    });

    it('should say on the axis when the points carry the irrelevant correction taken out', () => {
      const option = asOption(collapseChartOption({ ...result, model: { ...result.model, ni: 1 } }, LIGHT));
      expect(option.yAxis.name).toBe('Λ (corrected)');
    });
  });

  describe('the beta function', () => {
    it('should draw one series per pair of sizes against ln Lambda, with both error bars and the zero line', () => {
      const option = asOption(betaChartOption(result, LIGHT));
      const points = ofType(option, 'scatter');
      expect(points.map((s) => s.name)).toEqual(['L = 6–8', 'L = 8–10', 'L = 10–12', 'L = 12–16']);
      const b = result.beta[0];
      expect(ofType(option, 'custom')[0].data[0]).toEqual([b.lnValue, b.beta, b.beta - b.betaError, b.beta + b.betaError, b.lnValue - b.lnValueError, b.lnValue + b.lnValueError]);
      expect(option.series.find((s) => s.name === 'β = 0')?.markLine?.data).toEqual([{ yAxis: 0 }]);
      expect(option.xAxis.name).toBe('ln Λ');
    });
  });

  describe('drawing', () => {
    it('should render each chart with ECharts’ SVG renderer, error bars and all', async () => {
      for (const build of [pointsChartOption, collapseChartOption, betaChartOption]) {
        const svg = await renderChartSvg(build(result, LIGHT), { width: 800, height: 450, background: LIGHT.background });
        expect(svg.startsWith('<svg')).toBe(true);
        expect(svg).toContain(SERIES_LIGHT[0]);
        // Error bars are drawn as paths of the series' colour: far more than one per point.
        expect(svg.match(/<path/g)!.length).toBeGreaterThan(result.model.points);
      }
    });

    it('should repeat shapes only after seven sizes, and draw error bars without an x error', () => {
      expect(symbolOf(0)).toBe(symbolOf(7));
      expect(errorBarSeries('L = 8', '#000', [{ x: 1, y: 2, yError: 0.5 }]).data).toEqual([[1, 2, 1.5, 2.5, 1, 1]]);
    });
  });

  describe('what a screen reader hears', () => {
    it('should summarise each chart with the sizes and the fitted values', () => {
      const s = chartSummaries(result);
      expect(s.points).toContain('L = 6, 8, 10, 12, 16');
      expect(s.points).toMatch(/Wc = 16\.5\d\d \(16\.5\d\d to 16\.5\d\d\)/);
      expect(s.collapse).toContain('ν = ');
      expect(s.beta).toContain(`${result.beta.length} points`);
    });
  });
});
