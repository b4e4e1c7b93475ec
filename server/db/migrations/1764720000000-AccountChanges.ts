import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Account settings: when each session started, when it was last seen and from which browser; links that
 * confirm a change of e-mail address. Only nullable columns are added, one per statement, so the same
 * statements run on SQLite and PostgreSQL (only the timestamp type differs).
 */
export class AccountChanges1764720000000 implements MigrationInterface {
  name = 'AccountChanges1764720000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    const timestamp = timestampType(queryRunner);
    await queryRunner.query(`ALTER TABLE "sessions" ADD COLUMN "createdAt" ${timestamp}`);
    await queryRunner.query(`ALTER TABLE "sessions" ADD COLUMN "lastSeenAt" ${timestamp}`);
    await queryRunner.query(`ALTER TABLE "sessions" ADD COLUMN "userAgent" varchar(300)`);
    await queryRunner.query(`ALTER TABLE "email_verification_tokens" ADD COLUMN "newEmail" varchar(254)`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "email_verification_tokens" DROP COLUMN "newEmail"`);
    await queryRunner.query(`ALTER TABLE "sessions" DROP COLUMN "userAgent"`);
    await queryRunner.query(`ALTER TABLE "sessions" DROP COLUMN "lastSeenAt"`);
    await queryRunner.query(`ALTER TABLE "sessions" DROP COLUMN "createdAt"`);
  }
}

/** SQLite's `datetime` (what the entities declare today); PostgreSQL has no such type. */
function timestampType(queryRunner: QueryRunner): string {
  return queryRunner.connection.options.type === 'postgres' ? 'timestamp with time zone' : 'datetime';
}
