import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { User } from './User';

/**
 * Only the SHA-256 of a verification token is stored, like reset tokens. A link with `newEmail` confirms a
 * change of address (sent to the new address) and never confirms a sign-up.
 */
@Entity({ name: 'email_verification_tokens' })
export class EmailVerificationToken {
  @PrimaryColumn({ type: 'varchar', length: 64 })
  tokenHash: string;

  @Index()
  @Column({ type: 'varchar', length: 40 })
  userId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'userId' })
  user?: User;

  @Column({ type: 'datetime' })
  expiresAt: Date;

  @Column({ type: 'datetime', nullable: true })
  usedAt: Date | null;

  @Column({ type: 'varchar', length: 254, nullable: true })
  newEmail: string | null;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
