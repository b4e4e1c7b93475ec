import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import type { GrantableRole } from '../../../shared/notebook/sharing';
import { Notebook } from './Notebook';

/** A role offered by e-mail to an address with no confirmed account yet; granted once that address is confirmed. */
@Entity({ name: 'notebook_invitations' })
export class NotebookInvitation {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Index()
  @Column({ type: 'varchar', length: 40 })
  notebookId: string;

  @ManyToOne(() => Notebook, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'notebookId' })
  notebook?: Notebook;

  /** Normalised address (as users.emailKey). */
  @Index()
  @Column({ type: 'varchar', length: 254 })
  emailKey: string;

  @Column({ type: 'varchar', length: 254 })
  email: string;

  @Column({ type: 'varchar', length: 12 })
  role: GrantableRole;

  @Column({ type: 'varchar', length: 40 })
  invitedById: string;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @Column({ type: 'datetime' })
  expiresAt: Date;

  @Column({ type: 'datetime', nullable: true })
  acceptedAt: Date | null;

  @Column({ type: 'varchar', length: 40, nullable: true })
  acceptedById: string | null;
}
