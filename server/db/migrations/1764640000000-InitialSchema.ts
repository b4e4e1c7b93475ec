import type { MigrationInterface, QueryRunner } from 'typeorm';
import { migrate } from './portable';

/** Users, sessions, research groups and memberships, password-reset tokens, captured mail. */
export class InitialSchema1764640000000 implements MigrationInterface {
  name = 'InitialSchema1764640000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await migrate(
      queryRunner,
      `CREATE TABLE "users" ("id" varchar(40) PRIMARY KEY NOT NULL, "name" varchar(120) NOT NULL, "email" varchar(254) NOT NULL, "emailKey" varchar(254) NOT NULL, "passwordHash" varchar(255) NOT NULL, "siteRole" varchar(10) NOT NULL DEFAULT ('member'), "createdAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "UQ_ae137787c1f782e4c09ccc797bc" UNIQUE ("emailKey"))`,
    );
    await migrate(
      queryRunner,
      `CREATE TABLE "sessions" ("id" varchar(64) PRIMARY KEY NOT NULL, "userId" varchar(40) NOT NULL, "expiresAt" datetime NOT NULL, CONSTRAINT "FK_57de40bc620f456c7311aa3a1e6" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_57de40bc620f456c7311aa3a1e" ON "sessions" ("userId") `);
    await migrate(
      queryRunner,
      `CREATE TABLE "research_groups" ("id" varchar(40) PRIMARY KEY NOT NULL, "name" varchar(120) NOT NULL, "description" text NOT NULL DEFAULT (''), "createdAt" datetime NOT NULL DEFAULT (datetime('now')))`,
    );
    await migrate(
      queryRunner,
      `CREATE TABLE "group_memberships" ("groupId" varchar(40) NOT NULL, "userId" varchar(40) NOT NULL, "role" varchar(10) NOT NULL, "joinedAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_a434c0d46f4b97696924ecdd176" FOREIGN KEY ("groupId") REFERENCES "research_groups" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_ae52b7a8e0e084d7945522ef762" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, PRIMARY KEY ("groupId", "userId"))`,
    );
    await migrate(
      queryRunner,
      `CREATE TABLE "password_reset_tokens" ("tokenHash" varchar(64) PRIMARY KEY NOT NULL, "userId" varchar(40) NOT NULL, "expiresAt" datetime NOT NULL, "usedAt" datetime, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_d6a19d4b4f6c62dcd29daa497e2" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_d6a19d4b4f6c62dcd29daa497e" ON "password_reset_tokens" ("userId") `);
    await migrate(
      queryRunner,
      `CREATE TABLE "captured_mail" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "sender" varchar(500) NOT NULL, "recipients" varchar(2000) NOT NULL, "subject" varchar(500) NOT NULL, "textBody" text NOT NULL, "htmlBody" text, "receivedAt" datetime NOT NULL DEFAULT (datetime('now')))`,
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await migrate(queryRunner, `DROP TABLE "captured_mail"`);
    await migrate(queryRunner, `DROP INDEX "IDX_d6a19d4b4f6c62dcd29daa497e"`);
    await migrate(queryRunner, `DROP TABLE "password_reset_tokens"`);
    await migrate(queryRunner, `DROP TABLE "group_memberships"`);
    await migrate(queryRunner, `DROP TABLE "research_groups"`);
    await migrate(queryRunner, `DROP INDEX "IDX_57de40bc620f456c7311aa3a1e"`);
    await migrate(queryRunner, `DROP TABLE "sessions"`);
    await migrate(queryRunner, `DROP TABLE "users"`);
  }
}
