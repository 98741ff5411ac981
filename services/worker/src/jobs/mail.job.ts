import { createHash, randomUUID } from 'node:crypto';
import nodemailer from 'nodemailer';
import { GetObjectCommand } from '@aws-sdk/client-s3';
import { MailMessage, QUEUES, type Settings } from '@localis/shared';
import { createS3Client } from '@localis/shared/node';
import type { JobDefinition } from './job';

const SENT_TTL_SECONDS = 30 * 86_400;
/** Longer than any send may take (the SMTP timeouts below); a crashed worker's lease runs out. */
const SENDING_LEASE_MS = 60_000;
const SMTP_TIMEOUT_MS = 20_000;
/** Delete the lease only if it is still ours (it may have run out and been taken by a retry). */
const RELEASE_IF_OURS = "if redis.call('get', KEYS[1]) == ARGV[1] then return redis.call('del', KEYS[1]) else return 0 end";

/** Attachments are read from the object store when the mail is sent (they may be large; the queue holds only keys). */
async function attachmentsOf(list: NonNullable<MailMessage['attachments']>, settings: Settings) {
  const client = createS3Client(settings);
  try {
    return await Promise.all(
      list.map(async (a) => {
        const out = await client.send(new GetObjectCommand({ Bucket: settings.S3_BUCKET, Key: a.objectKey }));
        return { filename: a.filename, contentType: a.contentType, content: Buffer.from(await out.Body!.transformToByteArray()) };
      }),
    );
  } finally {
    client.destroy();
  }
}

/**
 * Send one e-mail. A retried job with the same dedupeKey is not sent again: the key is marked
 * in Redis after a successful send (a crash between send and mark can repeat one message,
 * which beats losing it). Two jobs of one message running at once (it was queued twice) do not
 * both send: the first holds a short lease and the other fails, to be retried after the mark.
 */
export const mailJob: JobDefinition<typeof MailMessage> = {
  name: QUEUES.mail,
  schema: MailMessage,
  async process(message, { settings, redis, logger }) {
    const keyHash = createHash('sha256').update(message.dedupeKey).digest('hex');
    const sentKey = `localis:mail:sent:${keyHash}`;
    const leaseKey = `localis:mail:sending:${keyHash}`;
    if (await redis.exists(sentKey)) return { skipped: 'already sent' };
    const owner = randomUUID();
    const release = () => redis.eval(RELEASE_IF_OURS, 1, leaseKey, owner);
    if ((await redis.set(leaseKey, owner, 'PX', SENDING_LEASE_MS, 'NX')) !== 'OK') {
      throw new Error('another job is sending the same message; this one retries after it');
    }
    // The other job may have finished between the check and the lease.
    if (await redis.exists(sentKey)) {
      await release();
      return { skipped: 'already sent' };
    }
    const transport = nodemailer.createTransport({
      host: settings.SMTP_HOST,
      port: settings.SMTP_PORT,
      secure: false,
      ignoreTLS: settings.SMTP_HOST === '127.0.0.1',
      // Well inside the lease, so a hung server never lets a second job send the same mail.
      connectionTimeout: SMTP_TIMEOUT_MS,
      greetingTimeout: SMTP_TIMEOUT_MS,
      socketTimeout: SMTP_TIMEOUT_MS,
    });
    try {
      const info = await transport.sendMail({
        from: settings.MAIL_FROM,
        to: message.to,
        subject: message.subject,
        text: message.text,
        // Mail readers that show HTML take it; the others read the text part.
        ...(message.html ? { html: message.html } : {}),
        ...(message.attachments?.length ? { attachments: await attachmentsOf(message.attachments, settings) } : {}),
        messageId: `<${keyHash.slice(0, 32)}@localis>`,
      });
      await redis.set(sentKey, info.messageId ?? '1', 'EX', SENT_TTL_SECONDS);
      logger.info({ to: message.to.length, subject: message.subject }, 'mail sent');
      return { messageId: info.messageId };
    } finally {
      transport.close();
      await release();
    }
  },
};
