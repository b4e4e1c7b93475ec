import { CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { Notebook } from './Notebook';
import { User } from './User';

/** A person who is told about changes to a notebook in their activity list. */
@Entity({ name: 'notebook_follows' })
export class NotebookFollow {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  notebookId: string;

  @PrimaryColumn({ type: 'varchar', length: 40 })
  userId: string;

  @ManyToOne(() => Notebook, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'notebookId' })
  notebook?: Notebook;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'userId' })
  user?: User;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
