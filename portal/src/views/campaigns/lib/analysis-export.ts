import { toCsv } from '@localis/shared';
import type { AnalysisTable } from './analysis-tables';

/**
 * The analysis page's downloads: every table as CSV and JSON with the raw numbers, every chart as
 * PNG and SVG, named "localis-<campaign>-<what>.<ext>" so a folder of them sorts by campaign.
 */

/** "Critical disorder of the 3D Anderson model" -> "critical-disorder-of-the-3d-anderson-model". */
export function campaignSlug(title: string): string {
  const slug = title
    .toLowerCase()
    .normalize('NFKD')
    // The accents come apart from their letters and are dropped: "é" -> "e", not "e-".
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '');
  return slug || 'campaign';
}

/** "localis-<campaign>-collapse.svg" */
export function analysisFileName(campaignTitle: string, what: string, extension: 'csv' | 'json' | 'png' | 'svg'): string {
  return `localis-${campaignSlug(campaignTitle)}-${what}.${extension}`;
}

/** The table as CSV (RFC 4180): its keys as the header, numbers with every digit they have. */
export function tableCsv(table: AnalysisTable): string {
  return toCsv(table.rows, table.columns.map((c) => c.key));
}

/** What the JSON download holds besides the rows: which analysis they come from. */
export interface TableSource {
  analysisId: string;
  campaignId: string;
  finishedAt: string | null;
}

/** The table as JSON: where it comes from, what it is, and its rows as objects keyed like the CSV. */
export function tableJson(table: AnalysisTable, source: TableSource): string {
  const keys = table.columns.map((c) => c.key);
  const rows = table.rows.map((row) => Object.fromEntries(keys.map((k) => [k, row[k] ?? null])));
  return `${JSON.stringify({ ...source, table: table.id, caption: table.caption, columns: keys, rows }, null, 2)}\n`;
}

/** The bytes of a `data:` URL (what ECharts hands out for a PNG) as a Blob. */
export function dataUrlToBlob(dataUrl: string): Blob {
  const match = /^data:([^;,]+)(;base64)?,(.*)$/s.exec(dataUrl);
  if (!match) throw new Error('not a data: URL');
  const [, type, base64, payload] = match;
  if (!base64) return new Blob([decodeURIComponent(payload)], { type });
  const binary = atob(payload);
  const bytes = new Uint8Array(binary.length);
  for (let i = 0; i < binary.length; i++) bytes[i] = binary.charCodeAt(i);
  return new Blob([bytes], { type });
}

/** Hands a Blob made in the browser to the person as a file. */
export function saveBlob(fileName: string, blob: Blob): void {
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  link.hidden = true;
  document.body.append(link);
  link.click();
  link.remove();
  // Revoked after the click has been handled; revoking at once can cancel the download.
  setTimeout(() => URL.revokeObjectURL(url), 0);
}
