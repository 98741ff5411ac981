import { NOTIFICATION_KIND_LABELS, type OptionalMailKind } from '@localis/shared';

/**
 * The words beside a mail switch, for the person reading them. The shared label covers every
 * audience at once; here the office reads that it hears of every proposal and everyone else of
 * their own group's.
 */
export function mailKindLabel(kind: OptionalMailKind, office: boolean): string {
  if (kind === 'proposal-submitted') return office ? 'Any group submits a proposal' : 'Your group submits a proposal';
  return NOTIFICATION_KIND_LABELS[kind];
}
