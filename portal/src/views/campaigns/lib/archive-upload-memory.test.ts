import { beforeEach, describe, expect, it } from 'vitest';
import { findRememberedUpload, forgetUpload, rememberedUploads, rememberUpload, type RememberedUpload } from './archive-upload-memory';

const CAMPAIGN = '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d';

function entry(archiveId: string, over: Partial<RememberedUpload> = {}): RememberedUpload {
  return { archiveId, campaignId: CAMPAIGN, kind: 'results', fileName: 'wc.tar.gz', sizeBytes: 1234, lastModified: 99, startedAt: '2027-03-01T09:00:00.000Z', ...over };
}

describe('archive upload memory', () => {
  beforeEach(() => localStorage.clear());

  describe('finding the upload of a picked file', () => {
    it('should match on campaign, name, size and modification time only', () => {
      rememberUpload(entry('a'));
      expect(findRememberedUpload(CAMPAIGN, { name: 'wc.tar.gz', size: 1234, lastModified: 99 })?.archiveId).toBe('a');
      expect(findRememberedUpload(CAMPAIGN, { name: 'wc.tar.gz', size: 1234, lastModified: 100 })).toBeNull();
      expect(findRememberedUpload(CAMPAIGN, { name: 'wc.tar.gz', size: 1235, lastModified: 99 })).toBeNull();
      expect(findRememberedUpload(CAMPAIGN, { name: 'other.tar.gz', size: 1234, lastModified: 99 })).toBeNull();
      expect(findRememberedUpload('9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d', { name: 'wc.tar.gz', size: 1234, lastModified: 99 })).toBeNull();
    });

    it('should offer the latest of two uploads of the same file', () => {
      rememberUpload(entry('a'));
      rememberUpload(entry('b'));
      expect(findRememberedUpload(CAMPAIGN, { name: 'wc.tar.gz', size: 1234, lastModified: 99 })?.archiveId).toBe('b');
    });
  });

  describe('keeping the list', () => {
    it('should replace an upload remembered twice and forget one by its archive', () => {
      rememberUpload(entry('a'));
      rememberUpload(entry('a', { sizeBytes: 5 }));
      rememberUpload(entry('b'));
      expect(rememberedUploads().map((e) => [e.archiveId, e.sizeBytes])).toEqual([
        ['a', 5],
        ['b', 1234],
      ]);
      forgetUpload('a');
      expect(rememberedUploads().map((e) => e.archiveId)).toEqual(['b']);
      forgetUpload('b');
      expect(localStorage.getItem('localis:archive-uploads')).toBeNull();
    });

    it('should keep the latest 20', () => {
      for (let i = 0; i < 25; i++) rememberUpload(entry(String(i)));
      expect(rememberedUploads().map((e) => e.archiveId)).toEqual(Array.from({ length: 20 }, (_, i) => String(i + 5)));
    });

    it('should read damaged or foreign contents as nothing remembered', () => {
      localStorage.setItem('localis:archive-uploads', '{not json');
      expect(rememberedUploads()).toEqual([]);
      localStorage.setItem('localis:archive-uploads', JSON.stringify([{ archiveId: 1 }, entry('ok')]));
      expect(rememberedUploads().map((e) => e.archiveId)).toEqual(['ok']);
    });

    it('should work without storage', () => {
      rememberUpload(entry('a'), null);
      expect(rememberedUploads(null)).toEqual([]);
      expect(findRememberedUpload(CAMPAIGN, { name: 'wc.tar.gz', size: 1234 }, null)).toBeNull();
    });
  });
});
