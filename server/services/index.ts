import type { DataSource } from 'typeorm';
import type { Logger } from 'pino';
import { createSessionService, type SessionService } from '../auth/sessions';
import type { ServerConfig } from '../config';
import type { Mailer } from '../mail/mailer';
import { createAccountService, type AccountService } from './accounts';
import { createGroupService, type GroupService } from './groups';
import { createPasswordResetService, type PasswordResetService } from './passwordReset';

export interface Services {
  config: ServerConfig;
  logger: Logger;
  dataSource: DataSource;
  mailer: Mailer;
  sessions: SessionService;
  accounts: AccountService;
  passwordReset: PasswordResetService;
  groups: GroupService;
}

export function createServices(config: ServerConfig, logger: Logger, dataSource: DataSource, mailer: Mailer): Services {
  const sessions = createSessionService(dataSource, config.publicUrl.startsWith('https://'));
  return {
    config,
    logger,
    dataSource,
    mailer,
    sessions,
    accounts: createAccountService(dataSource, mailer, config.publicUrl),
    passwordReset: createPasswordResetService(dataSource, mailer, sessions, config.publicUrl),
    groups: createGroupService(dataSource),
  };
}
