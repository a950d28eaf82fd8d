import { Logger } from '@nestjs/common';
import nodemailer from 'nodemailer';
import type { AppConfig } from '../config/app-config.js';
import { MailCatcher } from './mail-catcher.js';

export const MAIL_TRANSPORT = Symbol('MAIL_TRANSPORT');

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
}

/** A send the server did not take, in the server's own words. */
export class SendFailure extends Error {
  constructor(
    message: string,
    /** The server refused it for good (a 5xx answer): retrying would get the same answer. */
    readonly permanent: boolean,
  ) {
    super(message);
    this.name = 'SendFailure';
  }
}

/** Where alert mails go: the configured SMTP server, or the hub's own local mail catcher. */
export interface MailTransport {
  send(mail: OutgoingMail): Promise<void>;
  /** The local mail catcher, when the hub runs one. */
  readonly catcher: MailCatcher | null;
  close(): Promise<void>;
}

// A mail server that does not answer must not hold the outbox for minutes.
const TIMEOUTS = { connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 };

/** Builds the transport of the configuration; with no SMTP URL, starts the local catcher. */
export async function createMailTransport(config: AppConfig['mail']): Promise<MailTransport> {
  const logger = new Logger('Mail');
  let catcher: MailCatcher | null = null;
  let options: Parameters<typeof nodemailer.createTransport>[0];
  if (config.smtpUrl) {
    options = { url: config.smtpUrl, ...TIMEOUTS };
    // The host only: the URL carries the server's password.
    logger.log(`Alert mails go to ${new URL(config.smtpUrl).host}`);
  } else {
    catcher = new MailCatcher();
    const port = await catcher.start();
    options = { host: '127.0.0.1', port, secure: false, ignoreTLS: true, ...TIMEOUTS };
    logger.log(
      `No TARELINE_SMTP_URL: alert mails go to the local mail catcher (127.0.0.1:${port})`,
    );
  }
  const transporter = nodemailer.createTransport(options);
  return {
    catcher,
    async send(mail) {
      try {
        await transporter.sendMail({ from: config.from, ...mail });
      } catch (err) {
        throw asSendFailure(err);
      }
    },
    async close() {
      transporter.close();
      await catcher?.stop();
    },
  };
}

/** The server's words (its reply line when it answered, else the connection error). */
export function asSendFailure(err: unknown): SendFailure {
  const e = err as { response?: string; responseCode?: number; message?: string };
  const words = e.response?.trim() || e.message || String(err);
  return new SendFailure(words, typeof e.responseCode === 'number' && e.responseCode >= 500);
}
