import type { MigrationInterface, QueryRunner } from 'typeorm';
import { migrate } from './portable';

/** Notebooks, their cells, engine job runs (also the result cache), and notebook versions. */
export class Notebooks1764650000000 implements MigrationInterface {
  name = 'Notebooks1764650000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await migrate(
      queryRunner,
      `CREATE TABLE "notebooks" ("id" varchar(40) PRIMARY KEY NOT NULL, "title" varchar(200) NOT NULL, "summary" text NOT NULL DEFAULT (''), "ownerId" varchar(40) NOT NULL, "groupId" varchar(40), "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "updatedAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_2d37d48d6f9f35337bb19a77f71" FOREIGN KEY ("ownerId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_2b029f50ed37460a945949a0fec" FOREIGN KEY ("groupId") REFERENCES "research_groups" ("id") ON DELETE SET NULL ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_2d37d48d6f9f35337bb19a77f7" ON "notebooks" ("ownerId") `);
    await migrate(queryRunner, `CREATE INDEX "IDX_2b029f50ed37460a945949a0fe" ON "notebooks" ("groupId") `);
    await migrate(
      queryRunner,
      `CREATE TABLE "cells" ("id" varchar(40) PRIMARY KEY NOT NULL, "notebookId" varchar(40) NOT NULL, "position" integer NOT NULL, "kind" varchar(20) NOT NULL, "label" varchar(32) NOT NULL, "inputJson" text NOT NULL, "revision" integer NOT NULL DEFAULT (1), "lastRunId" varchar(40), "lastRunFingerprint" text, "updatedAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_f2f9473f4792fc4e488ccb168bc" FOREIGN KEY ("notebookId") REFERENCES "notebooks" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_f2f9473f4792fc4e488ccb168b" ON "cells" ("notebookId") `);
    await migrate(queryRunner, `CREATE UNIQUE INDEX "IDX_28034681afdd3bc2bbcdd72e06" ON "cells" ("notebookId", "label") `);
    await migrate(
      queryRunner,
      `CREATE TABLE "job_runs" ("id" varchar(40) PRIMARY KEY NOT NULL, "inputHash" varchar(64) NOT NULL, "engineVersion" varchar(40) NOT NULL, "jobJson" text NOT NULL, "status" varchar(12) NOT NULL, "progress" real NOT NULL DEFAULT (0), "cached" boolean NOT NULL DEFAULT (0), "cellId" varchar(40), "requestedBy" varchar(40), "startedAt" datetime, "finishedAt" datetime, "durationMs" integer, "resultJson" text, "errorJson" text, "createdAt" datetime NOT NULL DEFAULT (datetime('now')))`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_bd264c60ad4565ddef9f067db5" ON "job_runs" ("inputHash") `);
    await migrate(
      queryRunner,
      `CREATE TABLE "notebook_versions" ("id" varchar(40) PRIMARY KEY NOT NULL, "notebookId" varchar(40) NOT NULL, "number" integer NOT NULL, "message" varchar(500) NOT NULL, "automatic" boolean NOT NULL DEFAULT (0), "authorId" varchar(40) NOT NULL, "authorName" varchar(120) NOT NULL, "snapshotJson" text NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_b8f860ae0bef25ef5999a07d333" FOREIGN KEY ("notebookId") REFERENCES "notebooks" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE UNIQUE INDEX "IDX_59209a2bb9543485a64a6308c0" ON "notebook_versions" ("notebookId", "number") `);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await migrate(queryRunner, `DROP INDEX "IDX_59209a2bb9543485a64a6308c0"`);
    await migrate(queryRunner, `DROP TABLE "notebook_versions"`);
    await migrate(queryRunner, `DROP INDEX "IDX_bd264c60ad4565ddef9f067db5"`);
    await migrate(queryRunner, `DROP TABLE "job_runs"`);
    await migrate(queryRunner, `DROP INDEX "IDX_28034681afdd3bc2bbcdd72e06"`);
    await migrate(queryRunner, `DROP INDEX "IDX_f2f9473f4792fc4e488ccb168b"`);
    await migrate(queryRunner, `DROP TABLE "cells"`);
    await migrate(queryRunner, `DROP INDEX "IDX_2b029f50ed37460a945949a0fe"`);
    await migrate(queryRunner, `DROP INDEX "IDX_2d37d48d6f9f35337bb19a77f7"`);
    await migrate(queryRunner, `DROP TABLE "notebooks"`);
  }
}
