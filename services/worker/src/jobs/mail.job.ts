import { createHash } from 'node:crypto';
import nodemailer from 'nodemailer';
import { MailMessage, QUEUES } from '@localis/shared';
import type { JobDefinition } from './job';

const SENT_TTL_SECONDS = 30 * 86_400;

/**
 * Send one e-mail. A retried job with the same dedupeKey is not sent again: the key is marked
 * in Redis after a successful send (a crash between send and mark can repeat one message,
 * which beats losing it).
 */
export const mailJob: JobDefinition<typeof MailMessage> = {
  name: QUEUES.mail,
  schema: MailMessage,
  async process(message, { settings, redis, logger }) {
    const sentKey = `localis:mail:sent:${createHash('sha256').update(message.dedupeKey).digest('hex')}`;
    if (await redis.exists(sentKey)) return { skipped: 'already sent' };
    const transport = nodemailer.createTransport({
      host: settings.SMTP_HOST,
      port: settings.SMTP_PORT,
      secure: false,
      ignoreTLS: settings.SMTP_HOST === '127.0.0.1',
    });
    try {
      const info = await transport.sendMail({
        from: settings.MAIL_FROM,
        to: message.to,
        subject: message.subject,
        text: message.text,
        messageId: `<${createHash('sha256').update(message.dedupeKey).digest('hex').slice(0, 32)}@localis>`,
      });
      await redis.set(sentKey, info.messageId ?? '1', 'EX', SENT_TTL_SECONDS);
      logger.info({ to: message.to.length, subject: message.subject }, 'mail sent');
      return { messageId: info.messageId };
    } finally {
      transport.close();
    }
  },
};
