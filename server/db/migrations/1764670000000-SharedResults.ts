import type { MigrationInterface, QueryRunner } from 'typeorm';
import { migrate } from './portable';

/**
 * A cache hit points at the run that computed its result instead of holding a copy. Existing copies are
 * replaced by such a pointer where the computing run is still there, which gives their space back.
 */
export class SharedResults1764670000000 implements MigrationInterface {
  name = 'SharedResults1764670000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await migrate(queryRunner, `ALTER TABLE "job_runs" ADD COLUMN "resultRunId" varchar(40)`);
    await migrate(queryRunner, `CREATE INDEX "IDX_e41fb03d57cfdfc64d05cdcc27" ON "job_runs" ("resultRunId") `);
    await migrate(
      queryRunner,
      `UPDATE "job_runs" SET "resultRunId" = (
         SELECT s."id" FROM "job_runs" s WHERE s."inputHash" = "job_runs"."inputHash" AND s."status" = 'done' AND s."cached" = FALSE ORDER BY s."createdAt" DESC LIMIT 1
       ), "resultJson" = NULL
       WHERE "cached" = TRUE AND "status" = 'done' AND EXISTS (
         SELECT 1 FROM "job_runs" s WHERE s."inputHash" = "job_runs"."inputHash" AND s."status" = 'done' AND s."cached" = FALSE
       )`,
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await migrate(
      queryRunner,
      `UPDATE "job_runs" SET "resultJson" = (SELECT s."resultJson" FROM "job_runs" s WHERE s."id" = "job_runs"."resultRunId") WHERE "resultRunId" IS NOT NULL`,
    );
    await migrate(queryRunner, `DROP INDEX "IDX_e41fb03d57cfdfc64d05cdcc27"`);
    await migrate(queryRunner, `ALTER TABLE "job_runs" DROP COLUMN "resultRunId"`);
  }
}
