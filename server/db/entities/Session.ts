import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { User } from './User';

/** `id` is the SHA-256 (hex) of the session token in the cookie, never the token itself. */
@Entity({ name: 'sessions' })
export class Session {
  @PrimaryColumn({ type: 'varchar', length: 64 })
  id: string;

  @Index()
  @Column({ type: 'varchar', length: 40 })
  userId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'userId' })
  user?: User;

  @Column({ type: 'datetime' })
  expiresAt: Date;

  /** Null for sessions opened before these were kept. */
  @Column({ type: 'datetime', nullable: true })
  createdAt: Date | null;

  /** Written at most once a minute per session, not on every request. */
  @Column({ type: 'datetime', nullable: true })
  lastSeenAt: Date | null;

  /** The browser's User-Agent at sign-in, cut to 300 characters: only summarised ("Firefox on Linux") for its owner. */
  @Column({ type: 'varchar', length: 300, nullable: true })
  userAgent: string | null;
}
