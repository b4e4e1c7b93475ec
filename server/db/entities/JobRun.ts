import { Column, CreateDateColumn, Entity, Index, PrimaryColumn } from 'typeorm';

export type RunStatus = 'queued' | 'running' | 'done' | 'failed' | 'cancelled';

/** One execution (or cache hit) of an engine job. */
@Entity({ name: 'job_runs' })
export class JobRun {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  /** SHA-256 of the canonical job JSON and the engine version: equal hashes give equal results. */
  @Index()
  @Column({ type: 'varchar', length: 64 })
  inputHash: string;

  @Column({ type: 'varchar', length: 40 })
  engineVersion: string;

  @Column({ type: 'text' })
  jobJson: string;

  @Column({ type: 'varchar', length: 12 })
  status: RunStatus;

  @Column({ type: 'real', default: 0 })
  progress: number;

  @Column({ type: 'boolean', default: false })
  cached: boolean;

  @Column({ type: 'varchar', length: 40, nullable: true })
  cellId: string | null;

  @Column({ type: 'varchar', length: 40, nullable: true })
  requestedBy: string | null;

  @Column({ type: 'datetime', nullable: true })
  startedAt: Date | null;

  @Column({ type: 'datetime', nullable: true })
  finishedAt: Date | null;

  @Column({ type: 'integer', nullable: true })
  durationMs: number | null;

  /** The result itself; null on a cache hit, which points at the run that computed it (resultRunId). */
  @Column({ type: 'text', nullable: true })
  resultJson: string | null;

  /** On a cache hit: the run (never itself a cache hit) whose resultJson this run shows. */
  @Index()
  @Column({ type: 'varchar', length: 40, nullable: true })
  resultRunId: string | null;

  @Column({ type: 'text', nullable: true })
  errorJson: string | null;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
