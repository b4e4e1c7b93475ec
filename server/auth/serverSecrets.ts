import { randomBytes } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { ServerSecret } from '../db/entities';

/**
 * A 32-byte random secret kept in the database under `name`: drawn on first use, the same after every
 * restart. Concurrent first uses agree (INSERT OR IGNORE, then read back whichever value won).
 */
export async function keptSecret(dataSource: DataSource, name: string): Promise<Buffer> {
  await dataSource
    .createQueryBuilder()
    .insert()
    .into(ServerSecret)
    .values({ name, value: randomBytes(32).toString('base64url') })
    .orIgnore()
    .execute();
  const row = await dataSource.getRepository(ServerSecret).findOneByOrFail({ name });
  return Buffer.from(row.value, 'base64url');
}
