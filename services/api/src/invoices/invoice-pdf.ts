import PDFDocument from 'pdfkit';
import { band, type Doc, fitOneLine, measure, PageFlow, rule, type TextStyle, write } from './invoice-pdf-draw';
import { COLOUR, FONT, PAGE } from './invoice-pdf-style';
import { drawLineTable } from './invoice-pdf-table';
import { type InvoicePdfInput, type InvoicePdfView, invoicePdfView, type LabelledValue } from './invoice-pdf-view';

export type { InvoicePdfInput } from './invoice-pdf-view';

export interface InvoicePdfOptions {
  /** Compress page contents (default true); tests turn it off to read the text back. */
  compress?: boolean;
}

/** The band is at least this tall; a longer issuer address makes it taller. */
const HEADER_BAND_MIN_HEIGHT = 104;
const LABEL: TextStyle = { font: FONT.bold, size: 7.5, colour: COLOUR.teal700, characterSpacing: 0.8 };
const FOOTER: TextStyle = { size: 7, colour: COLOUR.stone600 };
const PAGE_NUMBER_WIDTH = 70;
const FOOTER_TEXT_WIDTH = PAGE.contentWidth - PAGE_NUMBER_WIDTH;
const LEFT_COLUMN_WIDTH = 235;
const RIGHT_COLUMN_WIDTH = 235;
const RIGHT_COLUMN_X = PAGE.right - RIGHT_COLUMN_WIDTH;
const ISSUER_WIDTH = 275;
const TOTALS_WIDTH = 270;

/** Page 1: the band with the wordmark and the issuer, then the title. Returns the y below them. */
function drawFirstPageHead(doc: Doc, view: InvoicePdfView): number {
  const issuerName: TextStyle = { font: FONT.bold, size: 9, colour: COLOUR.stone900, align: 'right' };
  const issuerLine: TextStyle = { size: 8.5, colour: COLOUR.stone700, align: 'right' };
  const issuerTop = 30;
  const issuerHeight = view.issuer.lines.reduce((sum, line) => sum + measure(doc, line, ISSUER_WIDTH, issuerLine), measure(doc, view.issuer.name, ISSUER_WIDTH, issuerName));
  const bandHeight = Math.max(HEADER_BAND_MIN_HEIGHT, issuerTop + issuerHeight + 14);

  band(doc, 0, 0, PAGE.width, bandHeight, COLOUR.teal50);
  band(doc, 0, bandHeight, PAGE.width, 3, COLOUR.teal700);
  write(doc, 'Localis', PAGE.margin, 34, 200, { font: FONT.bold, size: 28, colour: COLOUR.teal800 });
  let y = issuerTop;
  y += write(doc, view.issuer.name, PAGE.right - ISSUER_WIDTH, y, ISSUER_WIDTH, issuerName);
  for (const line of view.issuer.lines) y += write(doc, line, PAGE.right - ISSUER_WIDTH, y, ISSUER_WIDTH, issuerLine);

  y = bandHeight + 24;
  y += write(doc, view.title, PAGE.margin, y, PAGE.contentWidth, { font: FONT.bold, size: 20, colour: COLOUR.stone900 });
  if (view.subtitle) y += write(doc, view.subtitle, PAGE.margin, y + 2, PAGE.contentWidth, { size: 10, colour: COLOUR.stone600 }) + 2;
  return y + 18;
}

/** Later pages: one line that says whose page it is. */
function drawContinuationHead(doc: Doc, view: InvoicePdfView): number {
  const height = write(doc, `Localis · ${view.title} (continued)`, PAGE.margin, PAGE.margin, PAGE.contentWidth, {
    font: FONT.bold,
    size: 9,
    colour: COLOUR.teal800,
  });
  return PAGE.margin + height + 10;
}

function drawPartner(doc: Doc, view: InvoicePdfView, top: number): number {
  let y = top;
  y += write(doc, 'BILL TO', PAGE.margin, y, LEFT_COLUMN_WIDTH, LABEL) + 3;
  y += write(doc, view.partner.name, PAGE.margin, y, LEFT_COLUMN_WIDTH, { font: FONT.bold, size: 11 }) + 1;
  for (const line of view.partner.lines) y += write(doc, line, PAGE.margin, y, LEFT_COLUMN_WIDTH, { size: 9, colour: COLOUR.stone700 });
  return y;
}

/** Label on the left, value on the right, one pair a row. */
function drawPairs(doc: Doc, pairs: readonly LabelledValue[], box: { x: number; width: number; labelShare: number }, top: number, label: TextStyle, value: TextStyle): number {
  const labelWidth = box.width * box.labelShare;
  const valueWidth = box.width - labelWidth;
  let y = top;
  for (const pair of pairs) {
    const valueStyle = fitOneLine(doc, pair.value, valueWidth, { ...value, align: 'right' });
    const height = Math.max(measure(doc, pair.value, valueWidth, valueStyle), measure(doc, pair.label, labelWidth, label));
    write(doc, pair.label, box.x, y, labelWidth, label);
    write(doc, pair.value, box.x + labelWidth, y, valueWidth, valueStyle);
    y += height + 3;
  }
  return y;
}

function drawMeta(doc: Doc, view: InvoicePdfView, top: number): number {
  const box = { x: RIGHT_COLUMN_X, width: RIGHT_COLUMN_WIDTH, labelShare: 0.42 };
  return drawPairs(doc, view.meta, box, top, { size: 9, colour: COLOUR.stone600 }, { font: FONT.bold, size: 9 });
}

function drawTotals(doc: Doc, flow: PageFlow, view: InvoicePdfView): void {
  const label: TextStyle = { size: 9.5, colour: COLOUR.stone700 };
  const value: TextStyle = { size: 9.5, colour: COLOUR.stone900 };
  const grand: TextStyle = { font: FONT.bold, size: 12, colour: COLOUR.teal800 };
  const height = view.totals.length * 16 + 40;
  flow.y += 12;
  flow.makeRoom(height);
  const box = { x: PAGE.right - TOTALS_WIDTH, width: TOTALS_WIDTH, labelShare: 0.6 };
  flow.y = drawPairs(doc, view.totals, box, flow.y, label, value) + 3;
  rule(doc, box.x, PAGE.right, flow.y, COLOUR.teal700, 1);
  flow.y = drawPairs(doc, [view.grandTotal], box, flow.y + 6, grand, grand);
}

function drawNotes(doc: Doc, flow: PageFlow, view: InvoicePdfView): void {
  if (view.notes.length === 0) return;
  const note: TextStyle = { size: 8.5, colour: COLOUR.stone700 };
  const headingHeight = measure(doc, 'NOTES', PAGE.contentWidth, LABEL) + 3;
  flow.y += 16;
  flow.makeRoom(headingHeight + measure(doc, view.notes[0], PAGE.contentWidth, note));
  flow.y += write(doc, 'NOTES', PAGE.margin, flow.y, PAGE.contentWidth, LABEL) + 3;
  for (const text of view.notes) {
    flow.makeRoom(measure(doc, text, PAGE.contentWidth, note));
    flow.y += write(doc, text, PAGE.margin, flow.y, PAGE.contentWidth, note) + 4;
  }
}

function footerHeight(doc: Doc, view: InvoicePdfView): number {
  return view.footer.reduce((sum, text) => sum + measure(doc, text, FOOTER_TEXT_WIDTH, FOOTER) + 2, 8);
}

/** On every page: the rounding rule and the caution; "Page n of m" once there is more than one. */
function drawFooters(doc: Doc, view: InvoicePdfView, top: number): void {
  const { start, count } = doc.bufferedPageRange();
  for (let i = start; i < start + count; i++) {
    doc.switchToPage(i);
    rule(doc, PAGE.margin, PAGE.right, top, COLOUR.stone200);
    let y = top + 8;
    for (const text of view.footer) y += write(doc, text, PAGE.margin, y, FOOTER_TEXT_WIDTH, FOOTER) + 2;
    if (count > 1) write(doc, `Page ${i - start + 1} of ${count}`, PAGE.right - PAGE_NUMBER_WIDTH, top + 8, PAGE_NUMBER_WIDTH, { ...FOOTER, align: 'right' });
  }
}

function layout(doc: Doc, view: InvoicePdfView): void {
  const footerTop = PAGE.height - PAGE.margin - footerHeight(doc, view);
  const top = drawFirstPageHead(doc, view);
  const blockBottom = Math.max(drawPartner(doc, view, top), drawMeta(doc, view, top));
  const flow = new PageFlow(doc, blockBottom + 20, footerTop - 8, () => drawContinuationHead(doc, view));
  drawLineTable(doc, flow, view.rows);
  drawTotals(doc, flow, view);
  drawNotes(doc, flow, view);
  drawFooters(doc, view, footerTop);
}

/**
 * The invoice (or its credit note) as an A4 PDF in Localis' look, with Lato embedded. The same
 * input gives the same bytes: the PDF's dates come from the document's own day, and its file id
 * from them, so a stored PDF can be rendered again and compared.
 */
export async function renderInvoicePdf(input: InvoicePdfInput, options: InvoicePdfOptions = {}): Promise<Buffer> {
  const view = invoicePdfView(input);
  const day = new Date(`${view.documentDay}T00:00:00Z`);
  const doc = new PDFDocument({
    size: 'A4',
    margin: PAGE.margin,
    compress: options.compress ?? true,
    bufferPages: true,
    font: FONT.regular,
    lang: 'en',
    displayTitle: true,
    info: {
      Title: view.title,
      Author: input.issuer.name,
      Subject: `${view.title} for ${input.partner.name}`,
      Creator: 'Localis',
      Producer: 'Localis',
      CreationDate: day,
      ModDate: day,
    },
  });
  return new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    try {
      layout(doc, view);
      doc.end();
    } catch (error) {
      reject(error);
    }
  });
}
