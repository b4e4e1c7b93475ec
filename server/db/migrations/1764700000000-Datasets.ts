import type { MigrationInterface, QueryRunner } from 'typeorm';
import { migrate } from './portable';

/** Datasets attached to notebooks, and which datasets each version of a notebook holds. */
export class Datasets1764700000000 implements MigrationInterface {
  name = 'Datasets1764700000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await migrate(
      queryRunner,
      `CREATE TABLE "datasets" ("id" varchar(40) PRIMARY KEY NOT NULL, "notebookId" varchar(40) NOT NULL, "label" varchar(32) NOT NULL, "name" varchar(120) NOT NULL, "source" varchar(500) NOT NULL DEFAULT (''), "note" text NOT NULL DEFAULT (''), "shape" varchar(16) NOT NULL, "xAxisJson" varchar(200) NOT NULL, "yAxisJson" varchar(200) NOT NULL, "yErrors" varchar(16) NOT NULL, "xErrors" boolean NOT NULL DEFAULT (0), "rowCount" integer NOT NULL, "rangesJson" varchar(200) NOT NULL, "fileName" varchar(200), "pointsJson" text NOT NULL, "contentHash" varchar(64) NOT NULL, "createdById" varchar(40), "createdByName" varchar(120) NOT NULL, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), "removedAt" datetime, CONSTRAINT "FK_7e3e16e411f51dbbc1c1517d3c1" FOREIGN KEY ("notebookId") REFERENCES "notebooks" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_d5f15ac5390f9b439dc0150717" ON "datasets" ("notebookId", "removedAt")`);
    await migrate(
      queryRunner,
      `CREATE TABLE "notebook_version_datasets" ("versionId" varchar(40) NOT NULL, "datasetId" varchar(40) NOT NULL, CONSTRAINT "FK_9af8346a7c92c2f15fa8cff6d2d" FOREIGN KEY ("versionId") REFERENCES "notebook_versions" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_ad092f6732def33259130003cd3" FOREIGN KEY ("datasetId") REFERENCES "datasets" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, PRIMARY KEY ("versionId", "datasetId"))`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_ad092f6732def33259130003cd" ON "notebook_version_datasets" ("datasetId")`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await migrate(queryRunner, `DROP INDEX "IDX_ad092f6732def33259130003cd"`);
    await migrate(queryRunner, `DROP TABLE "notebook_version_datasets"`);
    await migrate(queryRunner, `DROP INDEX "IDX_d5f15ac5390f9b439dc0150717"`);
    await migrate(queryRunner, `DROP TABLE "datasets"`);
  }
}
