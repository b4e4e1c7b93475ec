import nodemailer, { type Transporter } from 'nodemailer';
import type SMTPTransport from 'nodemailer/lib/smtp-transport';
import type { Logger } from 'pino';
import type { MailConfig } from '../config';

export interface OutgoingMessage {
  to: string;
  subject: string;
  text: string;
}

/** Credentials the local mail fake was started with (drawn anew at every start). */
export interface SmtpCredential {
  user: string;
  pass: string;
}

export interface Mailer {
  send(message: OutgoingMessage): Promise<{ delivered: boolean }>;
  /**
   * Do the work off the request path: `compose` runs after the reply (it may look up the account and
   * return null when there is nothing to send); failures are logged and `onUndelivered` runs.
   */
  sendLater(compose: () => Promise<OutgoingMessage | null>, onUndelivered?: () => Promise<void>): void;
  /** Resolves when every message handed to sendLater so far has been tried. */
  idle(): Promise<void>;
  close(): Promise<void>;
}

/**
 * nodemailer transport options. The fake speaks plain SMTP on loopback; a real relay must upgrade to TLS
 * (STARTTLS) unless it already speaks TLS (SMTP_SECURE) or SMTP_REQUIRE_TLS=false: credentials and
 * sign-in links never travel in clear.
 */
export function transportOptions(config: MailConfig, fakeCredential?: SmtpCredential): SMTPTransport.Options {
  const relayAuth = config.smtpUser ? { user: config.smtpUser, pass: config.smtpPassword ?? '' } : undefined;
  return {
    host: config.smtpHost,
    port: config.smtpPort,
    secure: config.smtpSecure,
    auth: fakeCredential ?? relayAuth,
    ignoreTLS: config.startFake,
    requireTLS: config.requireTls && !config.smtpSecure && !config.startFake,
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 10000,
  };
}

/** Sends over SMTP: the built-in fake by default (authenticated with its per-start credential), a real relay when SMTP_HOST points at one. */
export function createMailer(config: MailConfig, logger: Logger, fakeCredential?: SmtpCredential): Mailer {
  const transport: Transporter = nodemailer.createTransport(transportOptions(config, fakeCredential));
  const pending = new Set<Promise<void>>();

  async function send(message: OutgoingMessage) {
    try {
      await transport.sendMail({ from: config.from, ...message });
      logger.info({ to: message.to, subject: message.subject }, 'mail sent');
      return { delivered: true };
    } catch (error) {
      logger.error({ err: error, to: message.to, subject: message.subject }, 'mail delivery failed');
      return { delivered: false };
    }
  }

  async function composeAndSend(compose: () => Promise<OutgoingMessage | null>, onUndelivered?: () => Promise<void>) {
    // Let the reply go out first, whatever compose does.
    await new Promise((resolve) => setImmediate(resolve));
    try {
      const message = await compose();
      if (message && !(await send(message)).delivered) await onUndelivered?.();
    } catch (error) {
      logger.error({ err: error }, 'background mail task failed');
    }
  }

  async function idle() {
    while (pending.size) await Promise.all([...pending]);
  }

  return {
    send,
    sendLater(compose, onUndelivered) {
      const task = composeAndSend(compose, onUndelivered);
      pending.add(task);
      void task.finally(() => pending.delete(task));
    },
    idle,
    async close() {
      await idle();
      transport.close();
    },
  };
}
