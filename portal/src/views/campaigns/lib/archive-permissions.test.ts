import type { Role } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { archivePermissions } from './archive-permissions';

const flags = (uploadResults = false, attachFiles = false, withdrawArchives = false) => ({ can: { uploadResults, attachFiles, withdrawArchives } });

describe('archivePermissions', () => {
  describe('uploads', () => {
    it("should offer result archives and attachments as the api's flags say", () => {
      expect(archivePermissions(['researcher'], flags(true, true)).uploadKinds).toEqual(['results', 'science-case', 'pilot-timings']);
      expect(archivePermissions(['researcher'], flags(false, true)).uploadKinds).toEqual(['science-case', 'pilot-timings']);
      expect(archivePermissions(['committee'], flags()).uploadKinds).toEqual([]);
    });
  });

  describe('downloads', () => {
    it('should be for everyone who reads campaigns', () => {
      for (const role of ['researcher', 'admin', 'committee', 'pi'] as Role[]) expect(archivePermissions([role], flags()).download).toBe(true);
      expect(archivePermissions(['billing'], flags()).download).toBe(false);
    });
  });

  describe('withdrawing', () => {
    it("should follow the api's flag (the group's PI and the office)", () => {
      expect(archivePermissions(['pi'], flags(false, false, true)).withdraw).toBe(true);
      expect(archivePermissions(['pi'], flags()).withdraw).toBe(false);
    });
  });
});
