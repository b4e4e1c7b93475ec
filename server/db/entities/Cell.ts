import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, UpdateDateColumn } from 'typeorm';
import type { CellKind } from '../../../shared/notebook/cells';
import { Notebook } from './Notebook';

@Entity({ name: 'cells' })
@Index(['notebookId', 'label'], { unique: true })
export class Cell {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Index()
  @Column({ type: 'varchar', length: 40 })
  notebookId: string;

  @ManyToOne(() => Notebook, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'notebookId' })
  notebook?: Notebook;

  @Column({ type: 'integer' })
  position: number;

  @Column({ type: 'varchar', length: 20 })
  kind: CellKind;

  @Column({ type: 'varchar', length: 32 })
  label: string;

  /** The cell input as JSON, valid against the shared cellInput schema. */
  @Column({ type: 'text' })
  inputJson: string;

  /** Increases on every saved edit; an edit made on an older revision is refused. */
  @Column({ type: 'integer', default: 1 })
  revision: number;

  @Column({ type: 'varchar', length: 40, nullable: true })
  lastRunId: string | null;

  /** Fingerprint of the inputs (own and upstream) the last run was made from. */
  @Column({ type: 'text', nullable: true })
  lastRunFingerprint: string | null;

  @UpdateDateColumn({ type: 'datetime' })
  updatedAt: Date;
}
