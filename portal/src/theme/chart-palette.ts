/**
 * The series colours of Localis' charts: hues that stay apart for the common kinds of colour
 * blindness, ordered so the first ones have at least 3:1 contrast against the card background
 * of their scheme (light: white; dark: stone 900). Charts always come with a table of the same
 * numbers, so colour never carries meaning alone.
 */
export const SERIES_LIGHT = ['#0072b2', '#d55e00', '#009e73', '#cc79a7', '#e69f00', '#56b4e9', '#5f5f5f'] as const;
export const SERIES_DARK = ['#56b4e9', '#e69f00', '#009e73', '#f0e442', '#cc79a7', '#d55e00', '#bdbdbd'] as const;

/** The i-th series colour of a scheme; more series than colours start over. */
export function seriesColor(index: number, dark: boolean): string {
  const palette = dark ? SERIES_DARK : SERIES_LIGHT;
  return palette[((index % palette.length) + palette.length) % palette.length];
}

/** Axis, grid and label colours, read from the preset's variables so charts follow light and dark. */
export function chartInk(): { text: string; muted: string; grid: string } {
  const style = getComputedStyle(document.documentElement);
  const read = (name: string, fallback: string) => style.getPropertyValue(name).trim() || fallback;
  return {
    text: read('--p-text-color', '#292524'),
    muted: read('--p-text-muted-color', '#57534e'),
    grid: read('--lcs-border', '#e7e5e4'),
  };
}
