/**
 * Reads back the text of a PDF that `renderInvoicePdf` wrote with `compress: false`, so tests can
 * check what a reader sees without poppler. With embedded fonts pdfkit writes glyph ids, not
 * characters; each font's ToUnicode map turns them back into text. Enough of PDF for our own
 * output, not a general parser.
 */

interface PdfObjects {
  body(id: string): string;
  stream(id: string): string;
}

function objects(pdf: string): PdfObjects {
  const bodies = new Map<string, string>();
  for (const match of pdf.matchAll(/(?:^|\n)(\d+) 0 obj\n([\s\S]*?)\nendobj/g)) bodies.set(match[1], match[2]);
  const body = (id: string) => {
    const text = bodies.get(id);
    if (text === undefined) throw new Error(`object ${id} is not in the PDF`);
    return text;
  };
  const stream = (id: string) => {
    const text = body(id);
    const start = text.indexOf('stream\n');
    const end = text.lastIndexOf('\nendstream');
    if (start < 0 || end < 0) throw new Error(`object ${id} has no stream (was the PDF compressed?)`);
    if (/\/Filter/.test(text.slice(0, start))) throw new Error(`object ${id} is compressed: render with compress: false`);
    return text.slice(start + 'stream\n'.length, end);
  };
  return { body, stream };
}

const ref = (text: string, key: string) => new RegExp(`/${key} (\\d+) 0 R`).exec(text)?.[1];

/** UTF-16BE hex ("0041 00e9") to text. */
const utf16 = (hex: string) => String.fromCharCode(...(hex.match(/[0-9a-f]{4}/gi) ?? []).map((h) => parseInt(h, 16)));

/** Glyph code (4 hex digits) to text, from pdfkit's "<start> <end> [<u> <u> ...]" ranges. */
function toUnicodeMap(cmap: string): Map<number, string> {
  const map = new Map<number, string>();
  for (const range of cmap.matchAll(/<([0-9a-f]{4})> <[0-9a-f]{4}> \[([^\]]*)\]/gi)) {
    const start = parseInt(range[1], 16);
    [...range[2].matchAll(/<([^>]*)>/g)].forEach((entry, i) => map.set(start + i, utf16(entry[1])));
  }
  return map;
}

/** Each page's text, one line per text object (pdfkit writes one per wrapped line). */
export function readPdfText(pdf: Buffer): string[] {
  const text = pdf.toString('latin1');
  const objs = objects(text);
  const catalog = ref(text.slice(text.lastIndexOf('trailer')), 'Root')!;
  const pageIds = [...objs.body(ref(objs.body(catalog), 'Pages')!).matchAll(/(\d+) 0 R/g)].map((m) => m[1]);

  const fonts = new Map<string, Map<number, string>>();
  const fontsOf = (page: string) => {
    const resources = objs.body(ref(page, 'Resources')!);
    for (const [, name, id] of /\/Font <<([\s\S]*?)>>/.exec(resources)?.[1].matchAll(/\/(\S+) (\d+) 0 R/g) ?? []) {
      if (!fonts.has(name)) fonts.set(name, toUnicodeMap(objs.stream(ref(objs.body(id), 'ToUnicode')!)));
    }
  };

  return pageIds.map((id) => {
    const page = objs.body(id);
    fontsOf(page);
    const lines: string[] = [];
    for (const block of objs.stream(ref(page, 'Contents')!).matchAll(/\nBT\n([\s\S]*?)\nET/g)) {
      const font = fonts.get(/\/(\S+) [\d.]+ Tf/.exec(block[1])?.[1] ?? '');
      let line = '';
      for (const run of block[1].matchAll(/\[(.*?)\] TJ/g)) {
        for (const hex of run[1].matchAll(/<([0-9a-f]*)>/gi)) {
          for (const code of hex[1].match(/[0-9a-f]{4}/gi) ?? []) line += font?.get(parseInt(code, 16)) ?? '\ufffd';
        }
      }
      lines.push(line);
    }
    return lines.join('\n');
  });
}

/** The glyph codes each page draws with: .notdef (0) means a character the font lacks. */
export function readGlyphCodes(pdf: Buffer): number[] {
  const text = pdf.toString('latin1');
  return [...text.matchAll(/\[(.*?)\] TJ/g)].flatMap((run) =>
    [...run[1].matchAll(/<([0-9a-f]*)>/gi)].flatMap((hex) => (hex[1].match(/[0-9a-f]{4}/gi) ?? []).map((code) => parseInt(code, 16))),
  );
}

/** A PDF literal string: "(...)" unescaped, UTF-16BE when it starts with a byte-order mark. */
function literal(text: string): string {
  const raw = text.trim().replace(/^\(|\)$/g, '').replace(/\\([\\()])/g, '$1');
  if (!raw.startsWith('\xfe\xff')) return raw;
  let out = '';
  for (let i = 2; i + 1 < raw.length; i += 2) out += String.fromCharCode((raw.charCodeAt(i) << 8) | raw.charCodeAt(i + 1));
  return out;
}

/** The document information dictionary (Title, CreationDate ...), values as written. */
export function readPdfInfo(pdf: Buffer): Record<string, string> {
  const text = pdf.toString('latin1');
  const objs = objects(text);
  const info = objs.body(ref(text.slice(text.lastIndexOf('trailer')), 'Info')!);
  return Object.fromEntries([...info.matchAll(/\/(\w+) (\d+) 0 R/g)].map(([, key, id]) => [key, literal(objs.body(id))]));
}
