import 'reflect-metadata';
import { startRungbook } from './boot';
import { ConfigError, loadConfig } from './config';
import { processLogger } from './jobs/logging';
import { demoPeople } from './seed/demo';

async function main() {
  const config = loadConfigOrExit();
  const logger = processLogger(config.logLevel, 'server');
  const rungbook = await startRungbook(config, logger, { listen: true });
  logger.info({ databasePath: config.databaseUrl ? undefined : config.databasePath, jobs: config.jobQueueUrl ? 'queue' : 'in-process', port: rungbook.port, demoDataCreated: rungbook.demoDataCreated }, 'started');
  printWelcome(config.publicUrl, config.seedDemoData && config.localOnly, config.mail.startFake && config.localOnly);

  let stopping = false;
  async function shutdown(signal: string) {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down');
    const forceExit = setTimeout(() => process.exit(1), 10_000).unref();
    await rungbook.stop();
    clearTimeout(forceExit);
    logger.info('stopped: connections closed, mail capture stopped, database closed');
    process.exit(0);
  }
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
}

function loadConfigOrExit() {
  try {
    return loadConfig();
  } catch (error) {
    if (!(error instanceof ConfigError)) throw error;
    process.stderr.write(`Rungbook refuses to start: ${error.message}\n`);
    process.exit(1);
  }
}

/** Local starts print the demo sign-ins; a server others can reach never prints a password. */
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
