import 'reflect-metadata';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Express } from 'express';
import type { Logger } from 'pino';
import { createApp } from './app';
import type { ServerConfig } from './config';
import { openDatabase } from './db/data-source';
import { createMailer } from './mail/mailer';
import { startSmtpFake, type SmtpFake } from './mail/smtp-fake';
import { attachDemoDatasets, disarmPublishedDemoAccounts, seedDemoDataIfEmpty } from './seed/demo';
import { connectSharedState } from './jobs/sharedState';
import { createServices, type Services } from './services';
import { failInterruptedRuns } from './services/runs';

export interface RunningRungbook {
  app: Express;
  services: Services;
  server?: Server;
  /** The port actually bound (useful when PORT=0). */
  port?: number;
  smtpFake?: SmtpFake;
  demoDataCreated: boolean;
  stop(): Promise<void>;
}

/** Open the database (running migrations), start the mail capture, seed, and optionally listen. */
export async function startRungbook(config: ServerConfig, logger: Logger, options: { listen: boolean }): Promise<RunningRungbook> {
  const dataSource = await openDatabase(config.databasePath, config.databaseUrl);
  let smtpFake: SmtpFake | undefined;
  if (config.mail.startFake) {
    smtpFake = await startSmtpFake(dataSource, config.mail.smtpPort, logger);
    config.mail.smtpPort = smtpFake.port;
  }
  const mailer = createMailer(config.mail, logger, smtpFake?.credential);
  // with a shared queue, other servers' runs are still going: only a lone server knows its runs were cut off
  if (!config.jobQueueUrl) await failInterruptedRuns(dataSource);
  const shared = await connectSharedState(config, logger);
  const services = createServices(config, logger, dataSource, mailer, shared.runner);
  const demoSeed = config.localOnly ? {} : { reachable: { password: config.demoPassword } };
  const demoDataCreated = config.seedDemoData ? await seedDemoDataIfEmpty(dataSource, demoSeed) : false;
  if (demoDataCreated) await attachDemoDatasets(dataSource, services.datasets);
  if (!config.localOnly) {
    const disarmed = await disarmPublishedDemoAccounts(dataSource);
    if (disarmed.length) logger.warn({ accounts: disarmed }, 'demo accounts still had their published passwords: given random passwords and no site-admin rights, because this start can be reached by others');
  }
  shared.attach(services);
  const app = createApp(services);

  let server: Server | undefined;
  if (options.listen) {
    // the first cell run after a start should not pay for loading the engine (server/jobs/worker.ts)
    await engineWarmOrTimeout(shared.runner.ready?.(), logger);
    server = app.listen(config.port, config.host);
    await new Promise<void>((resolve, reject) => {
      server!.once('listening', resolve);
      server!.once('error', reject);
    });
  }

  return {
    app,
    services,
    server,
    port: server ? (server.address() as AddressInfo).port : undefined,
    smtpFake,
    demoDataCreated,
    async stop() {
      // live streams never end by themselves: close them first so the server can close
      services.live.closeAll();
      if (server) {
        const closed = new Promise<void>((resolve) => server!.close(() => resolve()));
        server.closeAllConnections();
        await closed;
      }
      await services.runs.close();
      await shared.close();
      await services.documents.close();
      await mailer.close();
      await smtpFake?.stop();
      if (dataSource.isInitialized) await dataSource.destroy();
    },
  };
}

const ENGINE_WARM_WAIT_MS = 30_000;

/** Waits for the job threads to warm up, but never keeps the server from listening for long. */
async function engineWarmOrTimeout(ready: Promise<void> | undefined, logger: Logger): Promise<void> {
  if (!ready) return;
  let timer: NodeJS.Timeout | undefined;
  const timedOut = new Promise<'timeout'>((resolve) => { timer = setTimeout(() => resolve('timeout'), ENGINE_WARM_WAIT_MS); });
  const outcome = await Promise.race([ready.then(() => 'warm' as const), timedOut]);
  clearTimeout(timer);
  if (outcome === 'timeout') logger.warn({ waitedMs: ENGINE_WARM_WAIT_MS }, 'job threads did not report a warm engine in time; listening anyway');
}
