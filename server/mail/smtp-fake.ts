import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { Logger } from 'pino';
import type { DataSource } from 'typeorm';
import { CapturedMail } from '../db/entities';

export interface SmtpFake {
  port: number;
  stop(): Promise<void>;
}

function addressText(address: AddressObject | AddressObject[] | undefined): string {
  if (!address) return '';
  return (Array.isArray(address) ? address : [address]).map((entry) => entry.text).join(', ');
}

/**
 * A local stand-in for a hosted mail service: accepts any message over SMTP on loopback and stores it
 * in the captured_mail table, where admins read it (e.g. to follow a reset link).
 */
export async function startSmtpFake(dataSource: DataSource, port: number, logger: Logger): Promise<SmtpFake> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    banner: 'Rungbook local mail capture',
    size: 5 * 1024 * 1024,
    logger: false,
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
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
