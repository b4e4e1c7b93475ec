import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { Notebook } from './Notebook';
import { User } from './User';

/** A comment on a notebook or on one of its cells; a reply names its thread's first comment as parent. */
@Entity({ name: 'comments' })
export class Comment {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Index()
  @Column({ type: 'varchar', length: 40 })
  notebookId: string;

  @ManyToOne(() => Notebook, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'notebookId' })
  notebook?: Notebook;

  /** Not a foreign key: a thread outlives the cell it was written on. */
  @Column({ type: 'varchar', length: 40, nullable: true })
  cellId: string | null;

  @Column({ type: 'varchar', length: 32, nullable: true })
  cellLabel: string | null;

  /** The cell's revision when the comment was written. */
  @Column({ type: 'integer', nullable: true })
  cellRevision: number | null;

  @Index()
  @Column({ type: 'varchar', length: 40, nullable: true })
  parentId: string | null;

  @Column({ type: 'varchar', length: 40 })
  authorId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'authorId' })
  author?: User;

  @Column({ type: 'text' })
  body: string;

  /** JSON array of the ids of people with access this comment has mentioned (only grows: each is told once). */
  @Column({ type: 'text', default: '[]' })
  mentionsJson: string;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @Column({ type: 'datetime', nullable: true })
  editedAt: Date | null;

  @Column({ type: 'datetime', nullable: true })
  deletedAt: Date | null;

  @Column({ type: 'datetime', nullable: true })
  resolvedAt: Date | null;

  @Column({ type: 'varchar', length: 40, nullable: true })
  resolvedById: string | null;
}
