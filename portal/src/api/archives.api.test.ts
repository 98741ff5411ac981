import { describe, expect, it } from 'vitest';
import { recordApiCalls } from '../test/api-calls';
import { archivesApi } from './archives.api';
import { provenanceApi } from './provenance.api';

const ARCHIVE = '7c1d2e3f-4a5b-4c6d-8e7f-9a0b1c2d3e4f';
const CAMPAIGN = '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d';

describe('archivesApi', () => {
  const { call } = recordApiCalls();

  describe('the upload', () => {
    it('should create, list stored parts, ask for part addresses and complete at the routes of the api, with the CSRF token on writes', async () => {
      await archivesApi.create(CAMPAIGN, { kind: 'results', fileName: 'a.tar.gz', sizeBytes: 10 });
      await archivesApi.storedParts(ARCHIVE);
      await archivesApi.partUrls(ARCHIVE, [1, 2]);
      await archivesApi.complete(ARCHIVE, 'ab'.repeat(32));
      expect(call(0)).toEqual({ url: `/api/v1/campaigns/${CAMPAIGN}/archives`, method: 'POST', body: { kind: 'results', fileName: 'a.tar.gz', sizeBytes: 10 }, csrf: 'csrf-123' });
      expect(call(1)).toMatchObject({ url: `/api/v1/archives/${ARCHIVE}/parts`, method: 'GET', csrf: undefined });
      expect(call(2)).toMatchObject({ url: `/api/v1/archives/${ARCHIVE}/part-urls`, body: { partNumbers: [1, 2] }, csrf: 'csrf-123' });
      expect(call(3)).toMatchObject({ url: `/api/v1/archives/${ARCHIVE}/complete`, body: { sha256: 'ab'.repeat(32) } });
    });
  });

  describe('an archive', () => {
    it('should list, fetch a download address and withdraw with the reason', async () => {
      await archivesApi.list(CAMPAIGN);
      await archivesApi.downloadLink(ARCHIVE);
      await archivesApi.withdraw(ARCHIVE, 'wrong seeds in L = 16');
      expect(call(0)).toMatchObject({ url: `/api/v1/campaigns/${CAMPAIGN}/archives`, method: 'GET' });
      expect(call(1)).toMatchObject({ url: `/api/v1/archives/${ARCHIVE}/download`, method: 'GET' });
      expect(call(2)).toMatchObject({ url: `/api/v1/archives/${ARCHIVE}/withdraw`, method: 'POST', body: { reason: 'wrong seeds in L = 16' } });
    });
  });
});

describe('provenanceApi', () => {
  it('should give the PROV-JSON address of a campaign for a download link', () => {
    expect(provenanceApi.provJsonUrl(CAMPAIGN)).toBe(`/api/v1/campaigns/${CAMPAIGN}/provenance?format=prov-json`);
  });
});
