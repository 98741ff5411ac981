import { MailDev } from 'maildev';

export interface MailFakeOptions {
  host: string;
  smtpPort: number;
  inboxPort: number;
}

/** maildev: an SMTP server that keeps every message, with a REST inbox (`GET /api/email`). */
export async function startMailFake(opts: MailFakeOptions): Promise<{ close: () => Promise<void> }> {
  const maildev = new MailDev({ smtp: opts.smtpPort, web: opts.inboxPort, ip: opts.host, webIp: opts.host, silent: true });
  await maildev.start();
  return { close: () => maildev.stop() };
}
