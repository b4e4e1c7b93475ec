import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import type { LinkRole } from '../../../shared/notebook/sharing';
import { Notebook } from './Notebook';

/** A secret link granting viewer or commenter access; only the SHA-256 of its token is stored. */
@Entity({ name: 'share_links' })
export class ShareLink {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Index()
  @Column({ type: 'varchar', length: 40 })
  notebookId: string;

  @ManyToOne(() => Notebook, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'notebookId' })
  notebook?: Notebook;

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 64 })
  tokenHash: string;

  @Column({ type: 'varchar', length: 12 })
  role: LinkRole;

  @Column({ type: 'varchar', length: 40 })
  createdById: string;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @Column({ type: 'datetime', nullable: true })
  expiresAt: Date | null;

  @Column({ type: 'datetime', nullable: true })
  revokedAt: Date | null;
}
