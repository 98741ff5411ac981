import type PDFDocument from 'pdfkit';
import { COLOUR, FONT } from './invoice-pdf-style';

export type Doc = InstanceType<typeof PDFDocument>;

export interface TextStyle {
  font?: string;
  size: number;
  colour?: string;
  align?: 'left' | 'right' | 'center';
  /** Extra space between letters, for small capital labels. */
  characterSpacing?: number;
}

const LINE_GAP = 1.5;

function apply(doc: Doc, style: TextStyle): void {
  doc.font(style.font ?? FONT.regular).fontSize(style.size).fillColor(style.colour ?? COLOUR.stone900);
}

/** Height the text takes in `width` points, wrapped as `text` would wrap it. */
export function measure(doc: Doc, text: string, width: number, style: TextStyle): number {
  apply(doc, style);
  return doc.heightOfString(text, { width, lineGap: LINE_GAP, characterSpacing: style.characterSpacing ?? 0 });
}

/**
 * Writes text with its top at y, wrapped to width; returns the height used. Callers measure
 * first and start a new page themselves, so pdfkit never breaks a page on its own.
 */
export function write(doc: Doc, text: string, x: number, y: number, width: number, style: TextStyle): number {
  const height = measure(doc, text, width, style);
  doc.text(text, x, y, { width, align: style.align ?? 'left', lineGap: LINE_GAP, characterSpacing: style.characterSpacing ?? 0 });
  return height;
}

/**
 * The style at a smaller size if the text would not fit on one line: a figure that wraps in the
 * middle of its digits is misread, a slightly smaller one is not.
 */
export function fitOneLine(doc: Doc, text: string, width: number, style: TextStyle, smallest = 5): TextStyle {
  apply(doc, style);
  const natural = doc.widthOfString(text, { characterSpacing: style.characterSpacing ?? 0 });
  if (natural <= width) return style;
  return { ...style, size: Math.max(smallest, Math.floor(((style.size * width) / natural) * 10) / 10) };
}

export function rule(doc: Doc, x1: number, x2: number, y: number, colour: string, thickness = 0.75): void {
  doc.save().moveTo(x1, y).lineTo(x2, y).lineWidth(thickness).strokeColor(colour).stroke().restore();
}

export function band(doc: Doc, x: number, y: number, width: number, height: number, colour: string): void {
  doc.save().rect(x, y, width, height).fillColor(colour).fill().restore();
}

/**
 * Where the next block goes. A block that does not fit above the footer moves to a new page,
 * which `startPage` prepares (continuation title) and whose first free y it returns.
 */
export class PageFlow {
  constructor(
    private readonly doc: Doc,
    public y: number,
    private readonly bottom: number,
    private readonly startPage: () => number,
  ) {}

  /** Whether `height` more points fit on this page. */
  fits(height: number): boolean {
    return this.y + height <= this.bottom;
  }

  newPage(): void {
    this.doc.addPage();
    this.y = this.startPage();
  }

  /** Starts a new page unless `height` fits; true when it did. */
  makeRoom(height: number): boolean {
    if (this.fits(height)) return false;
    this.newPage();
    return true;
  }
}
