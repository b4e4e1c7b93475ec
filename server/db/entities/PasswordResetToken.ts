import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { User } from './User';

/** Only the SHA-256 of a reset token is stored, so a leaked database cannot reset passwords. */
@Entity({ name: 'password_reset_tokens' })
export class PasswordResetToken {
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

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
