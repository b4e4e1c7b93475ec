import type { DataSource } from 'typeorm';
import type { Logger } from 'pino';
import { createKnownDevices, deviceKeyIn, type KnownDevices } from '../auth/knownDevices';
import { createSessionService } from '../auth/sessions';
import type { ServerConfig } from '../config';
import type { Mailer } from '../mail/mailer';
import { createAccountService, type AccountService } from './accounts';
import { createAccountSessionService, trackSessionActivity, type AccountSessionService, type TrackedSessionService } from './accountSessions';
import { createAccountSettingsService, type AccountSettingsService } from './accountSettings';
import { createActivityService, type ActivityService } from './activity';
import { createCommentService, type CommentService } from './comments';
import { createDatasetService, type DatasetService } from './datasets';
import { createEmailVerificationService, type EmailVerificationService } from './emailVerification';
import { createGroupService, type GroupService } from './groups';
import { createLiveHub, type LiveHub } from './live';
import { createNotebookEventBus, type NotebookEventBus } from './notebookEvents';
import { createNotebookService, type NotebookService } from './notebooks';
import { createPasswordResetService, type PasswordResetService } from './passwordReset';
import { createRunService, type RunService } from './runs';
import { createSharingService, type SharingService } from './sharing';
import { senderLimit } from '../http/senderLimits';
import { createVersionService, type VersionService } from './versions';
import type { JobRunner } from '../jobs/runner';
import { createDocumentRenderer, type DocumentRenderer } from '../jobs/documents';

export interface Services {
  config: ServerConfig;
  logger: Logger;
  dataSource: DataSource;
  mailer: Mailer;
  /** Sessions, remembering when each started, was last seen and in which browser. */
  sessions: TrackedSessionService;
  /** A person's own sessions: list, end one, end the others. */
  accountSessions: AccountSessionService;
  /** Name, password and e-mail address changes. */
  accountSettings: AccountSettingsService;
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
  /** Grants, invitations, share links and ownership of notebooks. */
  sharing: SharingService;
  /** Renders exports (LaTeX) in a worker thread. */
  documents: DocumentRenderer;
  /** Comment threads, mentions and the notifications they cause. */
  comments: CommentService;
  /** Per-person activity lists, following notebooks, per-notebook logs. */
  activity: ActivityService;
  /** Live streams of notebooks: changes, presence, presenters, role changes. */
  live: LiveHub;
  /** Tables of numerical results attached to notebooks. */
  datasets: DatasetService;
}

export function createServices(config: ServerConfig, logger: Logger, dataSource: DataSource, mailer: Mailer, runner: JobRunner): Services {
  const secureCookies = config.publicUrl.startsWith('https://');
  const sessions = trackSessionActivity(createSessionService(dataSource, secureCookies), dataSource);
  const accountSessions = createAccountSessionService(dataSource, sessions);
  const events = createNotebookEventBus();
  const emailVerification = createEmailVerificationService(dataSource, mailer, sessions, config.publicUrl, undefined, events);
  const runs = createRunService(dataSource, runner, logger, config.jobs);
  const documents = createDocumentRenderer({ maxQueue: config.documentQueueLimit });
  const notebooks = createNotebookService(dataSource, runs, events, documents);
  const services: Services = {
    config,
    logger,
    dataSource,
    mailer,
    sessions,
    knownDevices: createKnownDevices(secureCookies, deviceKeyIn(dataSource)),
    emailVerification,
    accounts: createAccountService(dataSource, mailer, emailVerification, config.publicUrl),
    accountSessions,
    accountSettings: createAccountSettingsService({ dataSource, mailer, sessions, accountSessions, publicUrl: config.publicUrl, events }),
    passwordReset: createPasswordResetService(dataSource, mailer, sessions, config.publicUrl, undefined, events),
    groups: createGroupService(dataSource, events),
    runs,
    notebooks,
    events,
    versions: createVersionService(dataSource, notebooks, documents),
    sharing: createSharingService({
      dataSource, notebooks, events, mailer, publicUrl: config.publicUrl,
      invitationLimit: senderLimit(config.authLimits.invitationsPerSenderPerHour, 'invitation and sharing e-mails'),
    }),
    documents,
    comments: createCommentService({
      dataSource, notebooks, events, mailer, logger, publicUrl: config.publicUrl,
      mentionMailsPerSenderPerHour: config.authLimits.mentionMailsPerSenderPerHour,
      resolveLink: (token) => services.sharing.resolveLink(token),
    }),
    activity: createActivityService(dataSource, notebooks, events, logger),
    live: createLiveHub({ notebooks, events, sessions, logger, resolveLink: (token) => services.sharing.resolveLink(token) }),
    datasets: createDatasetService({
      dataSource, notebooks, documents,
      uploadLimit: senderLimit(config.authLimits.datasetUploadsPerUserPerHour, 'dataset uploads'),
      resolveLink: (token) => services.sharing.resolveLink(token),
    }),
  };
  return services;
}
