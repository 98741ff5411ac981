import { LATO } from './invoice-pdf-fonts';

/** Colours of the portal's preset (portal/src/theme/localis-preset.ts: teal primary, Aura's stone surfaces). */
export const COLOUR = {
  teal50: '#f0f9f8',
  teal100: '#d9f0ed',
  teal700: '#1a5f59',
  teal800: '#174d49',
  white: '#ffffff',
  stone200: '#e7e5e4',
  stone600: '#57534e',
  stone700: '#44403c',
  stone900: '#1c1917',
} as const;

export const FONT = LATO;

/** A4 in points with 50 pt margins. */
export const PAGE = {
  width: 595.28,
  height: 841.89,
  margin: 50,
  get contentWidth() {
    return this.width - 2 * this.margin;
  },
  get right() {
    return this.width - this.margin;
  },
} as const;
