import { Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { Dataset } from './Dataset';
import { NotebookVersion } from './NotebookVersion';

/** Which datasets a version of a notebook holds (a restore brings exactly these back). */
@Entity({ name: 'notebook_version_datasets' })
export class NotebookVersionDataset {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  versionId: string;

  @ManyToOne(() => NotebookVersion, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'versionId' })
  version?: NotebookVersion;

  @Index()
  @PrimaryColumn({ type: 'varchar', length: 40 })
  datasetId: string;

  @ManyToOne(() => Dataset, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'datasetId' })
  dataset?: Dataset;
}
