/** Entry names as archives store them, and the ones no extractor should ever write. */

/** The name an entry is compared under: no leading "./", no empty or "." parts, no trailing "/". */
export function normalizeEntryName(name: string): string {
  return name
    .split('/')
    .filter((part) => part !== '' && part !== '.')
    .join('/');
}

/** Why a name would escape the folder it is unpacked into (or be read differently elsewhere), or null. */
export function unsafeNameReason(name: string): string | null {
  if (name.startsWith('/')) return 'is an absolute path';
  if (/^[A-Za-z]:/.test(name)) return 'names a drive';
  if (name.includes('\\')) return 'contains a backslash, which Windows reads as a folder separator';
  if (name.includes('\0')) return 'contains a NUL character';
  if (name.split('/').includes('..')) return 'climbs out of the archive with ".."';
  return null;
}

export const MANIFEST_NAME = 'manifest.json';

/** Result tables are the CSV files; other files (raw data, logs) are only hashed. */
export function isTableName(normalizedName: string): boolean {
  return normalizedName.toLowerCase().endsWith('.csv');
}
