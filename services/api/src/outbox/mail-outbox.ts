import type { Transaction } from 'sequelize';
import { MailMessage, OUTBOX_KINDS } from '@localis/shared';
import { outboxRepository } from './outbox.repository';

/** Queue an e-mail in the same transaction as the change it reports. */
export async function enqueueMail(message: MailMessage, tx?: Transaction): Promise<void> {
  await outboxRepository.enqueue(OUTBOX_KINDS.mail, MailMessage.parse(message), tx);
}
