import { Column, CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import type { GroupRole } from '../../../shared/api/schemas';
import { ResearchGroup } from './ResearchGroup';
import { User } from './User';

@Entity({ name: 'group_memberships' })
export class GroupMembership {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  groupId: string;

  @PrimaryColumn({ type: 'varchar', length: 40 })
  userId: string;

  @Column({ type: 'varchar', length: 10 })
  role: GroupRole;

  @CreateDateColumn({ type: 'datetime' })
  joinedAt: Date;

  @ManyToOne(() => ResearchGroup, (group) => group.memberships, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'groupId' })
  group?: ResearchGroup;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'userId' })
  user?: User;
}
