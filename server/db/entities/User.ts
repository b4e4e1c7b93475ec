import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';
import type { SiteRole } from '../../../shared/api/schemas';

@Entity({ name: 'users' })
export class User {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Column({ type: 'varchar', length: 120 })
  name: string;

  /** As typed at sign-up; shown to people. */
  @Column({ type: 'varchar', length: 254 })
  email: string;

  /** Lower-cased e-mail: the unique key used for every comparison. */
  @Column({ type: 'varchar', length: 254, unique: true })
  emailKey: string;

  @Column({ type: 'varchar', length: 255 })
  passwordHash: string;

  @Column({ type: 'varchar', length: 10, default: 'member' })
  siteRole: SiteRole;

  /** When the owner proved the address by following the e-mailed link; null until then. */
  @Column({ type: 'datetime', nullable: true })
  emailVerifiedAt: Date | null;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
