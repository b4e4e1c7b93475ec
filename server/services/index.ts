import type { DataSource } from 'typeorm';
import type { Logger } from 'pino';
import { createKnownDevices, deviceKeyIn, type KnownDevices } from '../auth/knownDevices';
import { createSessionService, type SessionService } from '../auth/sessions';
import type { ServerConfig } from '../config';
import type { Mailer } from '../mail/mailer';
import { createAccountService, type AccountService } from './accounts';
import { createEmailVerificationService, type EmailVerificationService } from './emailVerification';
import { createGroupService, type GroupService } from './groups';
import { createNotebookEventBus, type NotebookEventBus } from './notebookEvents';
import { createNotebookService, type NotebookService } from './notebooks';
import { createPasswordResetService, type PasswordResetService } from './passwordReset';
import { createRunService, type RunService } from './runs';
import { createVersionService, type VersionService } from './versions';
import type { JobRunner } from '../jobs/runner';
import { createDocumentRenderer, type DocumentRenderer } from '../jobs/documents';

export interface Services {
  config: ServerConfig;
  logger: Logger;
  dataSource: DataSource;
  mailer: Mailer;
  sessions: SessionService;
  knownDevices: KnownDevices;
  emailVerification: EmailVerificationService;
  accounts: AccountService;
  passwordReset: PasswordResetService;
  groups: GroupService;
  runs: RunService;
  notebooks: NotebookService;
  /** Notebook changes and access changes, fanned out to live streams. */
  events: NotebookEventBus;
  versions: VersionService;
  /** Renders exports (LaTeX) in a worker thread. */
  documents: DocumentRenderer;
}

export function createServices(config: ServerConfig, logger: Logger, dataSource: DataSource, mailer: Mailer, runner: JobRunner): Services {
  const secureCookies = config.publicUrl.startsWith('https://');
  const sessions = createSessionService(dataSource, secureCookies);
  const emailVerification = createEmailVerificationService(dataSource, mailer, sessions, config.publicUrl);
  const runs = createRunService(dataSource, runner, logger, config.jobs);
  const events = createNotebookEventBus();
  const notebooks = createNotebookService(dataSource, runs);
  const documents = createDocumentRenderer({ maxQueue: config.documentQueueLimit });
  return {
    config,
    logger,
    dataSource,
    mailer,
    sessions,
    knownDevices: createKnownDevices(secureCookies, deviceKeyIn(dataSource)),
    emailVerification,
    accounts: createAccountService(dataSource, mailer, emailVerification, config.publicUrl),
    passwordReset: createPasswordResetService(dataSource, mailer, sessions, config.publicUrl),
    groups: createGroupService(dataSource),
    runs,
    notebooks,
    events,
    versions: createVersionService(dataSource, notebooks, documents),
    documents,
  };
}
