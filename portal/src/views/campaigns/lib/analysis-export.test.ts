import { describe, expect, it } from 'vitest';
import { analysisFileName, campaignSlug, dataUrlToBlob, tableCsv, tableJson } from './analysis-export';
import { scalingResultFixture } from './analysis-fixture';
import { crossingsTable, scanTable, type AnalysisTable } from './analysis-tables';

const SOURCE = { analysisId: '5e6f7a8b-9c0d-4e1f-8a2b-3c4d5e6f7a8b', campaignId: '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d', finishedAt: '2027-03-01T09:22:09.000Z' };

const small: AnalysisTable = {
  id: 'crossings',
  caption: 'Crossings',
  columns: [
    { key: 'L1', label: 'L', sub: '1' },
    { key: 'W', label: 'W' },
    { key: 'note', label: 'Note' },
  ],
  rows: [
    { L1: 8, W: 16.512345678901234, note: null },
    { L1: 12, W: -0.5, note: 'a "quoted", note' },
  ],
};

describe('analysis-export', () => {
  describe('file names', () => {
    it('should name files localis-<campaign>-<what>.<ext>', () => {
      expect(analysisFileName('Critical disorder of the 3D Anderson model', 'collapse', 'svg')).toBe('localis-critical-disorder-of-the-3d-anderson-model-collapse.svg');
      expect(analysisFileName('Énergie critique, W ≈ 16.5!', 'model-scan', 'csv')).toBe('localis-energie-critique-w-16-5-model-scan.csv');
    });

    it('should keep a slug short and never empty', () => {
      expect(campaignSlug('Λ')).toBe('campaign');
      expect(campaignSlug('a'.repeat(100))).toHaveLength(60);
      expect(campaignSlug(`${'word '.repeat(11)}end`).endsWith('-')).toBe(false);
    });
  });

  describe('CSV', () => {
    it('should head the columns with their keys and keep every digit (RFC 4180 quoting)', () => {
      expect(tableCsv(small)).toBe('L1,W,note\r\n8,16.512345678901234,\r\n12,-0.5,"a ""quoted"", note"\r\n');
    });

    it('should write the whole model scan, one line per model', () => {
      const result = scalingResultFixture();
      const lines = tableCsv(scanTable(result)).trim().split('\r\n');
      expect(lines[0]).toBe('nr,ni,mr,mi,parameters,Wc,nu,critical,y,chi2,dof,p,chosen,note');
      expect(lines).toHaveLength(result.scan.length + 1);
      expect(lines.filter((l) => l.includes(',true,'))).toHaveLength(1);
    });
  });

  describe('JSON', () => {
    it('should say which analysis the rows come from and key them like the CSV', () => {
      const parsed = JSON.parse(tableJson(small, SOURCE));
      expect(parsed).toEqual({
        ...SOURCE,
        table: 'crossings',
        caption: 'Crossings',
        columns: ['L1', 'W', 'note'],
        rows: [
          { L1: 8, W: 16.512345678901234, note: null },
          { L1: 12, W: -0.5, note: 'a "quoted", note' },
        ],
      });
    });

    it('should round-trip the crossings of a real analysis exactly', () => {
      const result = scalingResultFixture();
      const parsed = JSON.parse(tableJson(crossingsTable(result), SOURCE));
      expect(parsed.rows.map((r: { W: number }) => r.W)).toEqual(result.crossings.map((c) => c.x));
    });
  });

  describe('images', () => {
    it('should turn a base64 data: URL into its bytes', async () => {
      const blob = dataUrlToBlob('data:image/png;base64,iVBORw0K');
      expect(blob.type).toBe('image/png');
      expect([...new Uint8Array(await blob.arrayBuffer())]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a]);
    });

    it('should turn a plain data: URL into its text, and refuse anything else', async () => {
      expect(await dataUrlToBlob('data:image/svg+xml,%3Csvg%2F%3E').text()).toBe('<svg/>');
      expect(() => dataUrlToBlob('https://example.org/a.png')).toThrow('not a data: URL');
    });
  });
});
