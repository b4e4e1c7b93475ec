import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { Notebook } from './Notebook';

/**
 * A table of numerical results attached to a notebook (shared/notebook/datasets.ts). Its points never
 * change once written; removing it from the notebook sets `removedAt`, and the row is deleted only when no
 * version of the notebook holds it any more (notebook_version_datasets).
 */
@Entity({ name: 'datasets' })
@Index(['notebookId', 'removedAt'])
export class Dataset {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Column({ type: 'varchar', length: 40 })
  notebookId: string;

  @ManyToOne(() => Notebook, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'notebookId' })
  notebook?: Notebook;

  @Column({ type: 'varchar', length: 32 })
  label: string;

  @Column({ type: 'varchar', length: 120 })
  name: string;

  @Column({ type: 'varchar', length: 500, default: '' })
  source: string;

  @Column({ type: 'text', default: '' })
  note: string;

  /** 'points' or 'boundary'. */
  @Column({ type: 'varchar', length: 16 })
  shape: string;

  /** JSON AxisSpec: { kind, label? }. */
  @Column({ type: 'varchar', length: 200 })
  xAxisJson: string;

  @Column({ type: 'varchar', length: 200 })
  yAxisJson: string;

  /** 'none', 'symmetric' or 'asymmetric'. */
  @Column({ type: 'varchar', length: 16 })
  yErrors: string;

  @Column({ type: 'boolean', default: false })
  xErrors: boolean;

  @Column({ type: 'integer' })
  rowCount: number;

  /** JSON [min, max] of x and of y, as decimal text. */
  @Column({ type: 'varchar', length: 200 })
  rangesJson: string;

  @Column({ type: 'varchar', length: 200, nullable: true })
  fileName: string | null;

  /** JSON DatasetPoints: columns of decimal text, sorted by x. */
  @Column({ type: 'text' })
  pointsJson: string;

  /** SHA-256 hex of pointsJson and the axes: what comparison cells depend on. */
  @Column({ type: 'varchar', length: 64 })
  contentHash: string;

  @Column({ type: 'varchar', length: 40, nullable: true })
  createdById: string | null;

  @Column({ type: 'varchar', length: 120 })
  createdByName: string;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  /** Null while the dataset is in the notebook. */
  @Column({ type: 'datetime', nullable: true })
  removedAt: Date | null;
}
