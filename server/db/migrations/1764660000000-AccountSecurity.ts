import { createHash } from 'node:crypto';
import type { MigrationInterface, QueryRunner } from 'typeorm';
import { migrate } from './portable';

/**
 * E-mail verification (existing accounts count as verified) and session ids stored as SHA-256 hashes:
 * existing session rows are hashed in place, so people stay signed in across the upgrade.
 */
export class AccountSecurity1764660000000 implements MigrationInterface {
  name = 'AccountSecurity1764660000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await migrate(queryRunner, `ALTER TABLE "users" ADD COLUMN "emailVerifiedAt" datetime`);
    await migrate(queryRunner, `UPDATE "users" SET "emailVerifiedAt" = datetime('now')`);
    await migrate(
      queryRunner,
      `CREATE TABLE "email_verification_tokens" ("tokenHash" varchar(64) PRIMARY KEY NOT NULL, "userId" varchar(40) NOT NULL, "expiresAt" datetime NOT NULL, "usedAt" datetime, "createdAt" datetime NOT NULL DEFAULT (datetime('now')), CONSTRAINT "FK_10f285d038feb767bf7c2da14b3" FOREIGN KEY ("userId") REFERENCES "users" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`,
    );
    await migrate(queryRunner, `CREATE INDEX "IDX_10f285d038feb767bf7c2da14b" ON "email_verification_tokens" ("userId") `);
    const sessions: { id: string }[] = await migrate(queryRunner, `SELECT "id" FROM "sessions"`);
    for (const { id } of sessions) {
      await migrate(queryRunner, `UPDATE "sessions" SET "id" = ? WHERE "id" = ?`, [createHash('sha256').update(id).digest('hex'), id]);
    }
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    // Hashed session ids cannot be turned back into tokens: everyone signs in again.
    await migrate(queryRunner, `DELETE FROM "sessions"`);
    await migrate(queryRunner, `DROP INDEX "IDX_10f285d038feb767bf7c2da14b"`);
    await migrate(queryRunner, `DROP TABLE "email_verification_tokens"`);
    await migrate(queryRunner, `ALTER TABLE "users" DROP COLUMN "emailVerifiedAt"`);
  }
}
