import type { DataSource } from 'typeorm';
import type { CapturedMessage } from '../../shared/api/schemas';
import { CapturedMail } from '../db/entities';

/** Messages captured by the built-in SMTP fake, newest first. */
export async function listCapturedMail(dataSource: DataSource, limit = 100): Promise<CapturedMessage[]> {
  const rows = await dataSource.getRepository(CapturedMail).find({ order: { id: 'DESC' }, take: limit });
  return rows.map((row) => ({
    id: row.id,
    from: row.sender,
    to: row.recipients,
    subject: row.subject,
    text: row.textBody,
    receivedAt: row.receivedAt.toISOString(),
  }));
}
