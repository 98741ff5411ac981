import type { Database } from '../db';
import { notificationsRepository } from './notifications.repository';
import { notify } from './notify';

/** How long before a round closes people hear about it. */
export const CLOSING_NOTICE_DAYS = 14;

/**
 * Tell people about every round that closes within the next 14 days and has not had its notice:
 * one transaction per round, so the notices and the round's "sent" mark land together. A round
 * whose closing date moves is due again (the rounds repository clears the mark). Answers the
 * rounds it sent notices for.
 */
export async function sendRoundClosingNotices(db: Database, now: Date = new Date(), publicUrl?: string): Promise<string[]> {
  const until = new Date(now.getTime() + CLOSING_NOTICE_DAYS * 86_400_000);
  const sent: string[] = [];
  for (const roundId of await notificationsRepository.roundsDueForClosingNotice(now, until)) {
    const done = await db.transaction(async (tx) => {
      if (!(await notificationsRepository.claimClosingNotice(roundId, now, until, tx))) return false;
      await notify({ kind: 'round-closing', roundId }, tx, publicUrl);
      await notificationsRepository.markClosingNoticeSent(roundId, new Date(), tx);
      return true;
    });
    if (done) sent.push(roundId);
  }
  return sent;
}
