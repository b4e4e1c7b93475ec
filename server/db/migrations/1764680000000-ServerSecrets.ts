import type { MigrationInterface, QueryRunner } from 'typeorm';
import { migrate } from './portable';

/** Random values the server keeps across restarts, such as the key that signs known-device cookies. */
export class ServerSecrets1764680000000 implements MigrationInterface {
  name = 'ServerSecrets1764680000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await migrate(queryRunner, `CREATE TABLE "server_secrets" ("name" varchar(64) PRIMARY KEY NOT NULL, "value" varchar(200) NOT NULL)`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await migrate(queryRunner, `DROP TABLE "server_secrets"`);
  }
}
