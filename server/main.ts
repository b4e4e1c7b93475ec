import 'reflect-metadata';
import type { Server } from 'node:http';
import { pino } from 'pino';
import { createApp } from './app';
import { loadConfig } from './config';
import { openDatabase } from './db/data-source';
import { createMailer } from './mail/mailer';
import { startSmtpFake, type SmtpFake } from './mail/smtp-fake';
import { demoPeople, seedDemoDataIfEmpty } from './seed/demo';
import { createServices } from './services';

async function main() {
  const config = loadConfig();
  const logger = pino({ level: config.logLevel });
  const dataSource = await openDatabase(config.databasePath);
  logger.info({ databasePath: config.databasePath }, 'database ready (migrations applied)');

  let smtpFake: SmtpFake | undefined;
  if (config.mail.startFake) {
    smtpFake = await startSmtpFake(dataSource, config.mail.smtpPort, logger);
    config.mail.smtpPort = smtpFake.port;
  }
  const mailer = createMailer(config.mail, logger);
  const services = createServices(config, logger, dataSource, mailer);

  if (config.seedDemoData && (await seedDemoDataIfEmpty(dataSource))) logger.info('demo data created');

  const server: Server = createApp(services).listen(config.port, config.host);
  await new Promise<void>((resolve, reject) => {
    server.once('listening', resolve);
    server.once('error', reject);
  });
  printWelcome(config.publicUrl, config.seedDemoData, config.mail.startFake);

  let stopping = false;
  async function shutdown(signal: string) {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down');
    const forceExit = setTimeout(() => process.exit(1), 10_000).unref();
    await new Promise<void>((resolve) => server.close(() => resolve()));
    server.closeAllConnections();
    mailer.close();
    await smtpFake?.stop();
    await dataSource.destroy();
    clearTimeout(forceExit);
    logger.info('stopped');
    process.exit(0);
  }
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
}

function printWelcome(publicUrl: string, demo: boolean, mailFake: boolean) {
  const lines = [``, `  Rungbook is running at ${publicUrl}`];
  if (demo) {
    lines.push(``, `  Demo sign-ins (invented people, demo data):`);
    for (const person of demoPeople) lines.push(`    ${person.email.padEnd(32)} ${person.password.padEnd(18)} ${person.name}`);
  }
  if (mailFake) lines.push(``, `  Outgoing mail is captured locally; admins read it at ${publicUrl}/mail`);
  process.stdout.write(lines.join('\n') + '\n\n');
}

main().catch((error) => {
  process.stderr.write(`Rungbook failed to start: ${error instanceof Error ? error.stack : String(error)}\n`);
  process.exit(1);
});
