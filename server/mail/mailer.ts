import nodemailer, { type Transporter } from 'nodemailer';
import type { Logger } from 'pino';
import type { MailConfig } from '../config';

export interface OutgoingMessage {
  to: string;
  subject: string;
  text: string;
}

export interface Mailer {
  send(message: OutgoingMessage): Promise<{ delivered: boolean }>;
  close(): void;
}

/** Sends over SMTP: the built-in fake by default, a real relay when SMTP_HOST points at one. */
export function createMailer(config: MailConfig, logger: Logger): Mailer {
  const transport: Transporter = nodemailer.createTransport({
    host: config.smtpHost,
    port: config.smtpPort,
    secure: config.smtpSecure,
    auth: config.smtpUser ? { user: config.smtpUser, pass: config.smtpPassword ?? '' } : undefined,
    // The fake speaks plain SMTP on loopback; a real relay negotiates STARTTLS when it offers it.
    ignoreTLS: config.startFake,
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 10000,
  });
  return {
    async send(message) {
      try {
        await transport.sendMail({ from: config.from, ...message });
        logger.info({ to: message.to, subject: message.subject }, 'mail sent');
        return { delivered: true };
      } catch (error) {
        logger.error({ err: error, to: message.to, subject: message.subject }, 'mail delivery failed');
        return { delivered: false };
      }
    },
    close: () => transport.close(),
  };
}
