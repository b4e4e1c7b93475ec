import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import type { NotificationKind } from '../../../shared/notebook/sharing';
import { Notebook } from './Notebook';
import { User } from './User';

/** An entry of one person's activity list (mention, reply, invitation, change to a followed notebook). */
@Entity({ name: 'notifications' })
@Index(['userId', 'createdAt'])
export class Notification {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Column({ type: 'varchar', length: 40 })
  userId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'userId' })
  user?: User;

  @Column({ type: 'varchar', length: 20 })
  kind: NotificationKind;

  @Column({ type: 'varchar', length: 40, nullable: true })
  notebookId: string | null;

  @ManyToOne(() => Notebook, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'notebookId' })
  notebook?: Notebook | null;

  @Column({ type: 'varchar', length: 120, nullable: true })
  actorName: string | null;

  @Column({ type: 'varchar', length: 500 })
  text: string;

  @Column({ type: 'varchar', length: 40, nullable: true })
  commentId: string | null;

  @Column({ type: 'varchar', length: 40, nullable: true })
  cellId: string | null;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @Column({ type: 'datetime', nullable: true })
  readAt: Date | null;
}
