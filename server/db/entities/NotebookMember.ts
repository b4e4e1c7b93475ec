import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import type { GrantableRole } from '../../../shared/notebook/sharing';
import { Notebook } from './Notebook';
import { ResearchGroup } from './ResearchGroup';
import { User } from './User';

/** A role on a notebook granted to one person or to a whole group (exactly one of userId, groupId is set). */
@Entity({ name: 'notebook_members' })
@Index(['notebookId', 'userId'], { unique: true })
@Index(['notebookId', 'groupId'], { unique: true })
export class NotebookMember {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Column({ type: 'varchar', length: 40 })
  notebookId: string;

  @ManyToOne(() => Notebook, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'notebookId' })
  notebook?: Notebook;

  @Index()
  @Column({ type: 'varchar', length: 40, nullable: true })
  userId: string | null;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'userId' })
  user?: User | null;

  @Index()
  @Column({ type: 'varchar', length: 40, nullable: true })
  groupId: string | null;

  @ManyToOne(() => ResearchGroup, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'groupId' })
  group?: ResearchGroup | null;

  @Column({ type: 'varchar', length: 12 })
  role: GrantableRole;

  @Column({ type: 'varchar', length: 40, nullable: true })
  grantedById: string | null;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;
}
