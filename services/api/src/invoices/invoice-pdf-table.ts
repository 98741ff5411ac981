import { COLOUR, FONT, PAGE } from './invoice-pdf-style';
import { band, type Doc, fitOneLine, measure, type PageFlow, rule, type TextStyle, write } from './invoice-pdf-draw';
import type { TableRow } from './invoice-pdf-view';

interface Column {
  key: keyof TableRow;
  title: string;
  width: number;
  align: 'left' | 'right';
}

const FIXED: Column[] = [
  { key: 'campaign', title: 'Campaign', width: 132, align: 'left' },
  { key: 'month', title: 'Month', width: 46, align: 'left' },
  { key: 'description', title: 'Description', width: 136, align: 'left' },
  { key: 'coreHours', title: 'Core-hours', width: 62, align: 'right' },
  { key: 'unitPrice', title: 'Price per core-hour', width: 54, align: 'right' },
];
const COLUMNS: Column[] = [
  ...FIXED,
  { key: 'amount', title: 'Amount', width: PAGE.contentWidth - FIXED.reduce((sum, c) => sum + c.width, 0), align: 'right' },
];

const PAD_X = 4;
const PAD_Y = 4;
const HEAD: TextStyle = { font: FONT.bold, size: 7.5, colour: COLOUR.white };
const BODY: TextStyle = { size: 8.5, colour: COLOUR.stone900 };

/** Figures (the right-aligned columns) stay on one line, smaller if they must; words wrap. */
function cellStyle(doc: Doc, column: Column, text: string, base: TextStyle): TextStyle {
  const style = { ...base, align: column.align };
  return column.align === 'right' && base !== HEAD ? fitOneLine(doc, text, column.width - 2 * PAD_X, style) : style;
}

function height(doc: Doc, texts: (c: Column) => string, base: TextStyle): number {
  return Math.max(...COLUMNS.map((c) => measure(doc, texts(c), c.width - 2 * PAD_X, cellStyle(doc, c, texts(c), base)))) + 2 * PAD_Y;
}

function drawCells(doc: Doc, y: number, texts: (c: Column) => string, base: TextStyle): void {
  let x = PAGE.margin;
  for (const c of COLUMNS) {
    write(doc, texts(c), x + PAD_X, y + PAD_Y, c.width - 2 * PAD_X, cellStyle(doc, c, texts(c), base));
    x += c.width;
  }
}

function drawHead(doc: Doc, flow: PageFlow): void {
  const h = height(doc, (c) => c.title, HEAD);
  band(doc, PAGE.margin, flow.y, PAGE.contentWidth, h, COLOUR.teal800);
  drawCells(doc, flow.y, (c) => c.title, HEAD);
  flow.y += h;
}

/**
 * The lines, one row each; a row that does not fit goes to the next page under a repeated
 * header. Rows are never split, so a line's figures are read together.
 */
export function drawLineTable(doc: Doc, flow: PageFlow, rows: readonly TableRow[]): void {
  const headHeight = height(doc, (c) => c.title, HEAD);
  const rowHeights = rows.map((r) => height(doc, (c) => r[c.key], BODY));
  flow.makeRoom(headHeight + (rowHeights[0] ?? 0));
  drawHead(doc, flow);
  if (rows.length === 0) {
    write(doc, 'No core-hours were used in this period.', PAGE.margin + PAD_X, flow.y + PAD_Y, PAGE.contentWidth, { ...BODY, colour: COLOUR.stone600 });
    flow.y += height(doc, () => 'x', BODY);
  }
  rows.forEach((row, i) => {
    if (flow.makeRoom(rowHeights[i])) drawHead(doc, flow);
    if (i % 2 === 1) band(doc, PAGE.margin, flow.y, PAGE.contentWidth, rowHeights[i], COLOUR.teal50);
    drawCells(doc, flow.y, (c) => row[c.key], BODY);
    flow.y += rowHeights[i];
    rule(doc, PAGE.margin, PAGE.right, flow.y, COLOUR.stone200, 0.5);
  });
}
