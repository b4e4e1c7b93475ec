import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, UpdateDateColumn } from 'typeorm';
import { ResearchGroup } from './ResearchGroup';
import { User } from './User';

@Entity({ name: 'notebooks' })
export class Notebook {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Column({ type: 'varchar', length: 200 })
  title: string;

  @Column({ type: 'text', default: '' })
  summary: string;

  @Index()
  @Column({ type: 'varchar', length: 40 })
  ownerId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'ownerId' })
  owner?: User;

  @Index()
  @Column({ type: 'varchar', length: 40, nullable: true })
  groupId: string | null;

  @ManyToOne(() => ResearchGroup, { onDelete: 'SET NULL' })
  @JoinColumn({ name: 'groupId' })
  group?: ResearchGroup | null;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'datetime' })
  updatedAt: Date;
}
