import { ARCHIVE_KINDS, type ArchiveKind, type CampaignPermissions, type Role } from '@localis/shared';

export interface ArchivePermissions {
  /** What the person may upload here; empty hides the upload panel. */
  uploadKinds: ArchiveKind[];
  download: boolean;
  withdraw: boolean;
}

type ArchiveFlags = Pick<CampaignPermissions, 'uploadResults' | 'attachFiles' | 'withdrawArchives'>;

/**
 * What the archives page offers, from the flags the api computed for this person and campaign, so
 * only what will work is shown (the api decides again on every request). Result archives once the
 * campaign is granted; the science case and pilot timings go with the proposal at any time.
 * Everyone who reads the campaign may download its files (the committee included).
 */
export function archivePermissions(roles: readonly Role[], campaign: { can: ArchiveFlags }): ArchivePermissions {
  const { uploadResults, attachFiles, withdrawArchives } = campaign.can;
  return {
    uploadKinds: ARCHIVE_KINDS.filter((kind) => (kind === 'results' ? uploadResults : attachFiles)),
    download: ['researcher', 'pi', 'committee', 'admin'].some((r) => roles.includes(r as Role)),
    withdraw: withdrawArchives,
  };
}
