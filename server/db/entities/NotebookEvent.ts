import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import type { NotebookEventKind } from '../../../shared/notebook/sharing';
import { Notebook } from './Notebook';

/** One line of a notebook's activity log: who did what, when. */
@Entity({ name: 'notebook_events' })
@Index(['notebookId', 'createdAt'])
export class NotebookEvent {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Column({ type: 'varchar', length: 40 })
  notebookId: string;

  @ManyToOne(() => Notebook, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'notebookId' })
  notebook?: Notebook;

  /** Null for the system (e.g. a finished run). Not a foreign key: the log outlives accounts. */
  @Column({ type: 'varchar', length: 40, nullable: true })
  actorId: string | null;

  @Column({ type: 'varchar', length: 120, nullable: true })
  actorName: string | null;

  @Column({ type: 'varchar', length: 24 })
  kind: NotebookEventKind;

  @Column({ type: 'varchar', length: 40, nullable: true })
  cellId: string | null;

  @Column({ type: 'varchar', length: 500 })
  text: string;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
