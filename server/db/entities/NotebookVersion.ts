import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { Notebook } from './Notebook';

/** A snapshot of a notebook's cells (inputs and outputs) at one moment. Never changed once written. */
@Entity({ name: 'notebook_versions' })
@Index(['notebookId', 'number'], { unique: true })
export class NotebookVersion {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Column({ type: 'varchar', length: 40 })
  notebookId: string;

  @ManyToOne(() => Notebook, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'notebookId' })
  notebook?: Notebook;

  @Column({ type: 'integer' })
  number: number;

  @Column({ type: 'varchar', length: 500 })
  message: string;

  @Column({ type: 'boolean', default: false })
  automatic: boolean;

  @Column({ type: 'varchar', length: 40 })
  authorId: string;

  @Column({ type: 'varchar', length: 120 })
  authorName: string;

  /** JSON: { title, summary, cells: [{ label, kind, input, output }] }. */
  @Column({ type: 'text' })
  snapshotJson: string;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
