/**
 * Where clicking a notification leads: a path inside the portal, or nowhere. Links come from the
 * server, but only same-app paths are followed, never another site ("//host" or "https:").
 */
export function internalPath(link: string | null | undefined): string | null {
  if (!link || !link.startsWith('/') || link.startsWith('//') || link.startsWith('/\\')) return null;
  return link;
}

/** The bell's accessible name: what it is and how many wait. */
export function bellLabel(unread: number): string {
  if (unread === 0) return 'Notifications, none unread';
  return `Notifications, ${unread.toLocaleString('en')} unread`;
}

/** The count on the bell: short enough for the badge. */
export function badgeText(unread: number): string {
  return unread > 99 ? '99+' : String(unread);
}
