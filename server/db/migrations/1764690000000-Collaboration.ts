import type { MigrationInterface, QueryRunner } from 'typeorm';
import { dialectOf } from '../sql';
import { migrate } from './portable';

/**
 * Working together: roles on notebooks for people and groups, share links, e-mail invitations, comments,
 * the per-notebook activity log, each person's activity list and the notebooks they follow. A notebook
 * filed under a group so far gave that group editing rights: that becomes an editor grant to the group.
 */
export class Collaboration1764690000000 implements MigrationInterface {
  name = 'Collaboration1764690000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await migrate(
      queryRunner,
      `CREATE TABLE "notebook_members" ("id" varchar(40) PRIMARY KEY NOT NULL, "notebookId" varchar(40) NOT NULL, "userId" varchar(40), "groupId" varchar(40), "role" varchar(12) NOT NULL, "grantedById" varchar(40), "createdAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_bf5d110daa7a7517d9ff70d0b52" FOREIGN KEY ("notebookId") REFERENCES "notebooks" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_91d20ab18f3d07b1153c7eee25e" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_d52d1d113137906277f5eb3667f" FOREIGN KEY ("groupId") REFERENCES "research_groups" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_91d20ab18f3d07b1153c7eee25" ON "notebook_members" ("userId")`);
    await migrate(queryRunner, `CREATE INDEX "IDX_d52d1d113137906277f5eb3667" ON "notebook_members" ("groupId")`);
    await migrate(queryRunner, `CREATE UNIQUE INDEX "IDX_91fdfdfa810d1d46ce0907f9d1" ON "notebook_members" ("notebookId", "groupId")`);
    await migrate(queryRunner, `CREATE UNIQUE INDEX "IDX_fd691fb57caa2b561c92002d60" ON "notebook_members" ("notebookId", "userId")`);
    await migrate(
      queryRunner,
      `CREATE TABLE "share_links" ("id" varchar(40) PRIMARY KEY NOT NULL, "notebookId" varchar(40) NOT NULL, "tokenHash" varchar(64) NOT NULL, "role" varchar(12) NOT NULL, "createdById" varchar(40) NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "expiresAt" datetime, "revokedAt" datetime, CONSTRAINT "FK_c556b28bb02040d2d38f9ba3308" FOREIGN KEY ("notebookId") REFERENCES "notebooks" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_c556b28bb02040d2d38f9ba330" ON "share_links" ("notebookId")`);
    await migrate(queryRunner, `CREATE UNIQUE INDEX "IDX_e9e5c5ef9487ad94ae43d75741" ON "share_links" ("tokenHash")`);
    await migrate(
      queryRunner,
      `CREATE TABLE "notebook_invitations" ("id" varchar(40) PRIMARY KEY NOT NULL, "notebookId" varchar(40) NOT NULL, "emailKey" varchar(254) NOT NULL, "email" varchar(254) NOT NULL, "role" varchar(12) NOT NULL, "invitedById" varchar(40) NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "expiresAt" datetime NOT NULL, "acceptedAt" datetime, "acceptedById" varchar(40), CONSTRAINT "FK_fd608017aa3f1c9d6ea497b369e" FOREIGN KEY ("notebookId") REFERENCES "notebooks" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_fd608017aa3f1c9d6ea497b369" ON "notebook_invitations" ("notebookId")`);
    await migrate(queryRunner, `CREATE INDEX "IDX_e5bd84f0cda36a55ed023fdb88" ON "notebook_invitations" ("emailKey")`);
    await migrate(
      queryRunner,
      `CREATE TABLE "comments" ("id" varchar(40) PRIMARY KEY NOT NULL, "notebookId" varchar(40) NOT NULL, "cellId" varchar(40), "cellLabel" varchar(32), "cellRevision" integer, "parentId" varchar(40), "authorId" varchar(40) NOT NULL, "body" text NOT NULL, "mentionsJson" text NOT NULL DEFAULT ('[]'), "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "editedAt" datetime, "deletedAt" datetime, "resolvedAt" datetime, "resolvedById" varchar(40), CONSTRAINT "FK_b977abfa68b31cc7d3f879fbc4e" FOREIGN KEY ("notebookId") REFERENCES "notebooks" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_4548cc4a409b8651ec75f70e280" FOREIGN KEY ("authorId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_b977abfa68b31cc7d3f879fbc4" ON "comments" ("notebookId")`);
    await migrate(queryRunner, `CREATE INDEX "IDX_8770bd9030a3d13c5f79a7d2e8" ON "comments" ("parentId")`);
    await migrate(
      queryRunner,
      `CREATE TABLE "notebook_events" ("id" varchar(40) PRIMARY KEY NOT NULL, "notebookId" varchar(40) NOT NULL, "actorId" varchar(40), "actorName" varchar(120), "kind" varchar(24) NOT NULL, "cellId" varchar(40), "text" varchar(500) NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_14d50d3fe3320766efdd68c1b6f" FOREIGN KEY ("notebookId") REFERENCES "notebooks" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_7c7fc25e80fc33f9792939bba7" ON "notebook_events" ("notebookId", "createdAt")`);
    await migrate(
      queryRunner,
      `CREATE TABLE "notifications" ("id" varchar(40) PRIMARY KEY NOT NULL, "userId" varchar(40) NOT NULL, "kind" varchar(20) NOT NULL, "notebookId" varchar(40), "actorName" varchar(120), "text" varchar(500) NOT NULL, "commentId" varchar(40), "cellId" varchar(40), "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "readAt" datetime, CONSTRAINT "FK_692a909ee0fa9383e7859f9b406" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_4ef318045675052075cdb7eb7ae" FOREIGN KEY ("notebookId") REFERENCES "notebooks" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_21e65af2f4f242d4c85a92aff4" ON "notifications" ("userId", "createdAt")`);
    await migrate(
      queryRunner,
      `CREATE TABLE "notebook_follows" ("notebookId" varchar(40) NOT NULL, "userId" varchar(40) NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_5635c919d5275829d278f6c965b" FOREIGN KEY ("notebookId") REFERENCES "notebooks" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_fb2546a3799cfc0da615c57ebcf" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, PRIMARY KEY ("notebookId", "userId"))`,
    );
    const randomId = dialectOf(queryRunner) === 'postgres' ? 'substr(md5(random()::text), 1, 24)' : 'lower(hex(randomblob(12)))';
    await migrate(
      queryRunner,
      `INSERT INTO "notebook_members" ("id", "notebookId", "groupId", "role", "grantedById") SELECT ${randomId}, "id", "groupId", 'editor', "ownerId" FROM "notebooks" WHERE "groupId" IS NOT NULL`,
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await migrate(queryRunner, `DROP TABLE "notebook_follows"`);
    await migrate(queryRunner, `DROP INDEX "IDX_21e65af2f4f242d4c85a92aff4"`);
    await migrate(queryRunner, `DROP TABLE "notifications"`);
    await migrate(queryRunner, `DROP INDEX "IDX_7c7fc25e80fc33f9792939bba7"`);
    await migrate(queryRunner, `DROP TABLE "notebook_events"`);
    await migrate(queryRunner, `DROP INDEX "IDX_b977abfa68b31cc7d3f879fbc4"`);
    await migrate(queryRunner, `DROP INDEX "IDX_8770bd9030a3d13c5f79a7d2e8"`);
    await migrate(queryRunner, `DROP TABLE "comments"`);
    await migrate(queryRunner, `DROP INDEX "IDX_fd608017aa3f1c9d6ea497b369"`);
    await migrate(queryRunner, `DROP INDEX "IDX_e5bd84f0cda36a55ed023fdb88"`);
    await migrate(queryRunner, `DROP TABLE "notebook_invitations"`);
    await migrate(queryRunner, `DROP INDEX "IDX_c556b28bb02040d2d38f9ba330"`);
    await migrate(queryRunner, `DROP INDEX "IDX_e9e5c5ef9487ad94ae43d75741"`);
    await migrate(queryRunner, `DROP TABLE "share_links"`);
    await migrate(queryRunner, `DROP INDEX "IDX_91d20ab18f3d07b1153c7eee25"`);
    await migrate(queryRunner, `DROP INDEX "IDX_d52d1d113137906277f5eb3667"`);
    await migrate(queryRunner, `DROP INDEX "IDX_91fdfdfa810d1d46ce0907f9d1"`);
    await migrate(queryRunner, `DROP INDEX "IDX_fd691fb57caa2b561c92002d60"`);
    await migrate(queryRunner, `DROP TABLE "notebook_members"`);
  }
}
