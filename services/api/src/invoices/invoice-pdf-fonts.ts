import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

/**
 * Lato as the portal ships it (@fontsource/lato), so the PDF looks like the app and needs no
 * network. Paths, not bytes: pdfkit keeps one font object per path, and the document's default
 * font is the regular one, so no other font is ever loaded.
 */
export const LATO = {
  regular: require.resolve('@fontsource/lato/files/lato-latin-400-normal.woff'),
  bold: require.resolve('@fontsource/lato/files/lato-latin-700-normal.woff'),
} as const;

/**
 * The characters both Lato latin files draw (regular and bold hold the same set): printable ASCII
 * and the ones below. Anything else would print as an empty box, so `printable` replaces it.
 * `invoice-pdf.test.ts` renders every one of them in both weights and checks that none falls back to .notdef.
 */
const BEYOND_ASCII = '\u00a0¡¢£¤¥¦§¨©ª«¬\u00ad®¯°±²³´µ¶·¸¹º»¼½¾¿ÀÁÂÃÄÅÆÇÈÉÊËÌÍÎÏÐÑÒÓÔÕÖ×ØÙÚÛÜÝÞßàáâãäåæçèéêëìíîïðñòóôõö÷øùúûüýþÿıŒœˆ˚˜–—‘’‚“”„•…‹›⁄€™−';

const DRAWABLE = new Set<string>([...Array.from({ length: 0x7f - 0x20 }, (_, i) => String.fromCharCode(0x20 + i)), ...BEYOND_ASCII]);

export const isDrawable = (char: string): boolean => DRAWABLE.has(char);

/** All of them, in code point order. */
export const DRAWABLE_CHARACTERS: string = [...DRAWABLE].join('');

/** Letters with a stroke that Unicode does not decompose into base letter + mark. */
const UNDECOMPOSABLE: Record<string, string> = { Ł: 'L', ł: 'l', Đ: 'D', đ: 'd', Ħ: 'H', ħ: 'h', Ŧ: 'T', ŧ: 't', ĸ: 'k' };

function substitute(char: string): string {
  if (/^\s$/u.test(char)) return ' '; // narrow, thin and other spaces that Intl or a pasted name may carry
  if (/^\p{Pd}$/u.test(char)) return '-';
  if (/^\p{Cf}$/u.test(char)) return ''; // direction marks and other invisible format characters
  if (UNDECOMPOSABLE[char]) return UNDECOMPOSABLE[char];
  // Ő -> O: the letter without its accent is closer to the name than a box.
  const base = char.normalize('NFD').replace(/\p{M}/gu, '');
  if (base && [...base].every(isDrawable)) return base;
  return '?';
}

/** The text with every character the fonts lack replaced by its nearest drawable form. */
export function printable(text: string): string {
  let out = '';
  for (const char of text.normalize('NFC')) out += isDrawable(char) ? char : substitute(char);
  return out;
}
