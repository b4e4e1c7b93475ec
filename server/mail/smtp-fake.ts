import { randomBytes, timingSafeEqual } from 'node:crypto';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { Logger } from 'pino';
import type { DataSource } from 'typeorm';
import { CapturedMail } from '../db/entities';
import type { SmtpCredential } from './mailer';

export interface SmtpFake {
  port: number;
  /** What the server's own mailer must authenticate with; drawn anew at every start. */
  credential: SmtpCredential;
  stop(): Promise<void>;
}

function addressText(address: AddressObject | AddressObject[] | undefined): string {
  if (!address) return '';
  return (Array.isArray(address) ? address : [address]).map((entry) => entry.text).join(', ');
}

function sameText(given: string, expected: string): boolean {
  const a = Buffer.from(given);
  const b = Buffer.from(expected);
  return a.length === b.length && timingSafeEqual(a, b);
}

/**
 * A local stand-in for a hosted mail service: accepts messages over SMTP on loopback and stores them
 * in the captured_mail table, where admins read them (e.g. to follow a reset link). Only the server's
 * own mailer knows the per-start credential, so other local programs cannot plant messages.
 */
export async function startSmtpFake(dataSource: DataSource, port: number, logger: Logger): Promise<SmtpFake> {
  const credential: SmtpCredential = { user: 'rungbook', pass: randomBytes(24).toString('base64url') };
  const server = new SMTPServer({
    authOptional: false,
    authMethods: ['PLAIN', 'LOGIN'],
    // Plain-text AUTH is acceptable here: the capture listens on loopback only.
    allowInsecureAuth: true,
    disabledCommands: ['STARTTLS'],
    banner: 'Rungbook local mail capture',
    size: 5 * 1024 * 1024,
    logger: false,
    onAuth(auth, _session, callback) {
      if (auth.username && auth.password && sameText(auth.username, credential.user) && sameText(auth.password, credential.pass)) {
        return callback(null, { user: auth.username });
      }
      logger.warn('mail capture refused a client without the server credential');
      callback(new Error('Invalid username or password'));
    },
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          await dataSource.getRepository(CapturedMail).insert({
            sender: addressText(parsed.from).slice(0, 500),
            recipients: addressText(parsed.to).slice(0, 2000),
            subject: (parsed.subject ?? '').slice(0, 500),
            textBody: parsed.text ?? '',
            htmlBody: typeof parsed.html === 'string' ? parsed.html : null,
          });
          callback();
        })
        .catch((error: Error) => {
          logger.error({ err: error }, 'mail capture failed');
          callback(error);
        });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  const boundPort = typeof address === 'object' && address ? address.port : port;
  logger.info({ port: boundPort }, 'mail capture listening');
  return {
    port: boundPort,
    credential,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
